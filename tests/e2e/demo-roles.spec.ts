import { test } from '@playwright/test';
import { expect } from './support/expect';
import { freshEmail } from './support/mail';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo users (scripts/seed.ts); the password is the one the README and `npm run app` print.
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';

test('a designer signs in with a password and sees the Tallgrass designs', async ({ page }) => {
  await new SignInPage(page).withPassword('dev.designer@tallgrass.test', DEMO_PASSWORD);
  const teams = new TeamsPage(page);
  await teams.expectLoaded();
  await teams.openTeam(TEAM);
  const designs = new TeamDesignsPage(page);
  await expect(designs.rows().first()).toBeVisible();
  expect(await designs.rows().count()).toBeGreaterThanOrEqual(3);
  // The seeded fork shows its parent in the table.
  await expect(designs.rows().filter({ has: page.locator('td:nth-child(7) a') })).not.toHaveCount(0);
  await expect(page.getByTestId('new-design')).toBeVisible();

  // Search narrows the list.
  const firstTitle = (await page.getByTestId('design-link').first().textContent())?.trim() ?? '';
  await page.getByTestId('design-search').fill(firstTitle);
  await expect(designs.rows().filter({ hasText: firstTitle }).first()).toBeVisible();

  await designs.openDesign(firstTitle);
  await expect(page.getByTestId('fork-design')).toBeVisible();
});

test('a viewer sees the designs but no New design or Fork buttons', async ({ page }) => {
  await new SignInPage(page).withPassword('val.viewer@tallgrass.test', DEMO_PASSWORD);
  const teams = new TeamsPage(page);
  await teams.openTeam(TEAM);
  const designs = new TeamDesignsPage(page);
  await expect(designs.rows().first()).toBeVisible();
  await expect(page.getByText('You are a viewer here.')).toBeVisible();
  await expect(page.getByTestId('new-design')).toHaveCount(0);

  const title = (await page.getByTestId('design-link').first().textContent())?.trim() ?? '';
  await designs.openDesign(title);
  await expect(page.getByTestId('document-summary')).toBeVisible();
  await expect(page.getByTestId('fork-design')).toHaveCount(0);
  await expect(page.getByTestId('toggle-archive')).toHaveCount(0);
});

// A fresh address, so repeated runs never push a demo account into the failed sign-in limit.
test('a wrong password is refused with a message', async ({ page }) => {
  await page.goto('/signin');
  await page.getByLabel('E-mail', { exact: true }).fill(freshEmail('nobody'));
  await page.getByLabel('Password', { exact: true }).fill('not-the-password');
  await page.getByTestId('password-signin-submit').click();
  await expect(page.getByTestId('signin-error')).toContainText('do not match');
  await expect(page).toHaveURL(/\/signin/);
});

test('a signed-out visit to a team page goes to sign-in and comes back after it', async ({ page }) => {
  await page.goto('/teams');
  await expect(page).toHaveURL(/\/signin\?callbackUrl=%2Fteams$/);
  await expect(page.getByTestId('safety-footer')).toContainText('High voltage');
  await new SignInPage(page).withPasswordHere('rue.reviewer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  await expect(page.getByText('You are a reviewer here.')).toBeVisible();
  await expect(page.getByTestId('new-design')).toHaveCount(0);
});

test('after five wrong passwords the address is refused for a while', async ({ page }) => {
  const email = freshEmail('locked');
  await page.goto('/signin');
  await page.getByLabel('E-mail', { exact: true }).fill(email);
  const password = page.getByLabel('Password', { exact: true });
  const error = page.getByTestId('signin-error');
  for (let i = 1; i <= 5; i++) {
    await password.fill(`wrong-password-${i}`);
    await page.getByTestId('password-signin-submit').click();
    await expect(error).toContainText('do not match');
    // Wait for the form to be usable again before the next try.
    await expect(page.getByTestId('password-signin-submit')).toBeEnabled();
  }
  await password.fill('wrong-password-6');
  await page.getByTestId('password-signin-submit').click();
  await expect(error).toContainText('Too many attempts, try again later.');
});
