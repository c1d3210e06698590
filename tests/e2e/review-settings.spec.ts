import { test } from '@playwright/test';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

const DEMO_PASSWORD = 'kilorung-demo-1';

test('a designer asks for a review (never of themself), withdraws it, and the status goes back to draft', async ({ page }) => {
  await new SignInPage(page).withPassword('dev.designer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam('Tallgrass Instruments');
  await new TeamDesignsPage(page).createDesign({ title: `Withdrawn ${Date.now().toString(36)}`, starter: 'half-wave', stages: 2, amplitude: '1k', frequency: '20k', capacitance: '10n' });
  await page.getByTestId('request-review').click();
  // The author is never offered; Ada (owner) and Rue (reviewer) are, the viewer is not.
  await expect(page.getByTestId('reviewer-option')).toHaveCount(2);
  await expect(page.getByTestId('reviewer-option').filter({ hasText: 'Dev' })).toHaveCount(0);
  await expect(page.getByTestId('send-review-request')).toBeDisabled();
  await page.getByTestId('reviewer-option').filter({ hasText: 'Rue' }).check();
  await page.getByTestId('send-review-request').click();
  await expect(page.getByTestId('review-status')).toContainText('In review');
  // The author cannot decide their own review.
  await expect(page.getByTestId('approve-review')).toHaveCount(0);
  page.on('dialog', (d) => void d.accept());
  await page.getByTestId('withdraw-review').click();
  await expect(page.getByTestId('review-status')).toContainText('Draft');
  await expect(page.getByTestId('review-history-item').first()).toContainText('Withdrawn');
});

test('a mail switch is saved the moment it is flipped and stays after a reload', async ({ page }) => {
  await new SignInPage(page).withPassword('val.viewer@tallgrass.test', DEMO_PASSWORD);
  await page.goto('/settings/notifications');
  const sw = page.locator('[data-testid="notification-switch"][data-kind="mention"]');
  await expect(sw).toHaveAttribute('aria-checked', 'true');
  await sw.click();
  await expect(page.getByTestId('notifications-saved')).toContainText('off');
  await page.reload();
  await expect(sw).toHaveAttribute('aria-checked', 'false');
  const fromApi = (await (await page.request.get('/api/me/notifications')).json()) as { settings: Record<string, boolean> };
  expect(fromApi.settings.mention).toBe(false);
  // back on, so the demo account stays as seeded
  await sw.click();
  await expect(sw).toHaveAttribute('aria-checked', 'true');
  await page.reload();
  await expect(sw).toHaveAttribute('aria-checked', 'true');
});
