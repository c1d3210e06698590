import { test } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { waitForLink } from './support/mail';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo users (scripts/seed.ts).
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const OWNER = 'ada.owner@tallgrass.test';
const DESIGNER = 'dev.designer@tallgrass.test';

test('a designer forks an owner’s ladder, changes a capacitor and offers it back; the owner compares and accepts it as a new revision', async ({ page, browser }) => {
  test.setTimeout(240_000);
  // The owner starts a two-stage ladder.
  await new SignInPage(page).withPassword(OWNER, DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  const title = `Offer parent ${Date.now().toString(36)}`;
  const parentId = await new TeamDesignsPage(page).createDesign({ title, starter: 'half-wave', stages: 2, amplitude: '1k', frequency: '20k', capacitance: '10n' });
  await new EditorPage(page).ready();

  // The designer forks it, changes the bottom smoothing capacitor, saves and offers the fork back.
  const dev = await (await browser.newContext()).newPage();
  await new SignInPage(dev).withPassword(DESIGNER, DEMO_PASSWORD);
  await dev.goto(`/designs/${parentId}`);
  await dev.getByTestId('fork-design').click();
  await expect(dev).not.toHaveURL(new RegExp(parentId));
  const forkId = new URL(dev.url()).pathname.split('/').pop() as string;
  const ed = new EditorPage(dev);
  await ed.ready();
  await expect(dev.getByTestId('lineage-parent')).toContainText(title);
  await ed.selectBlock('s1');
  await ed.setField('field-smoothC-capacitanceF', '47n');
  await dev.getByTestId('save-revision').click();
  await dev.getByTestId('revision-message').fill('Bottom smoothing capacitor 10 nF → 47 nF');
  await dev.getByTestId('save-revision-confirm').click();
  await expect(dev.getByTestId('revision-item')).toHaveCount(2);
  await dev.getByTestId('offer-back').click();
  await dev.getByTestId('offer-message').fill('Lower ripple for the same drive');
  await dev.getByTestId('send-offer').click();
  await expect(dev.getByTestId('outgoing-offer')).toHaveAttribute('data-state', 'open');

  // The owner gets the mail with the compare link: the change and its effect show before deciding.
  const link = await waitForLink(page.request, OWNER, `/designs/${parentId}/compare?`);
  expect(link).toContain(`bDesign=${forkId}`);
  await page.goto(new URL(link).pathname + new URL(link).search);
  await expect(page.locator('[data-testid="compare-change"][data-block="s1"]')).toContainText('10 nF → 47 nF');
  await expect(page.locator('[data-testid="compare-metric"][data-metric="outputDc"]')).toBeVisible();
  await expect(page.getByTestId('offer-state')).toContainText(/waiting/i);
  await page.getByTestId('accept-offer').click();
  await expect(page.getByTestId('offer-result')).toContainText('r2');

  // The parent now has the fork's document as revision 2, authored by the designer.
  const res = await page.request.get(`/api/designs/${parentId}/revisions`);
  const body = (await res.json()) as { revisions: { number: number; author: { email: string }; message: string }[] };
  const r2 = body.revisions.find((r) => r.number === 2);
  expect(r2?.author.email).toBe(DESIGNER);
  expect(r2?.message).toContain('Offered back');
  await dev.reload();
  await expect(dev.getByTestId('outgoing-offer')).toHaveAttribute('data-state', 'accepted');
});
