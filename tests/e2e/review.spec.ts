import { test, type Browser, type Page } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { waitForLink } from './support/mail';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo users (scripts/seed.ts).
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const DESIGNER = 'dev.designer@tallgrass.test';
const REVIEWER = 'rue.reviewer@tallgrass.test';

/** Open a mailed link in a fresh signed-out browser: sign-in comes first, then the exact place. */
async function followAsReviewer(browser: Browser, link: string): Promise<Page> {
  const page = await (await browser.newContext()).newPage();
  const url = new URL(link);
  await page.goto(url.pathname + url.search);
  await expect(page).toHaveURL(/\/signin\?callbackUrl=/);
  await page.getByLabel('E-mail', { exact: true }).fill(REVIEWER);
  await page.getByLabel('Password', { exact: true }).fill(DEMO_PASSWORD);
  await page.getByLabel('Password', { exact: true }).press('Enter');
  await expect(page).toHaveURL((u) => u.pathname === url.pathname && u.search.includes(url.searchParams.get('review') ?? '-'));
  return page;
}

async function askForReview(page: Page, note: string): Promise<void> {
  await page.getByTestId('request-review').click();
  await page.getByTestId('reviewer-option').filter({ hasText: 'Rue' }).check();
  await page.getByTestId('review-note').fill(note);
  await page.getByTestId('send-review-request').click();
  await expect(page.getByTestId('review-status')).toContainText('In review');
}

test('a designer asks for a review; the reviewer follows the mail, pins a comment to a node and asks for changes; after a capacitor change the reviewer compares the revisions and approves', async ({ page, browser }) => {
  test.setTimeout(300_000);
  // The designer starts a three-stage ladder and asks Rue to review revision 1.
  await new SignInPage(page).withPassword(DESIGNER, DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  const title = `Review ${Date.now().toString(36)}`;
  const designId = await new TeamDesignsPage(page).createDesign({ title, starter: 'half-wave', stages: 3, amplitude: '1k', frequency: '20k', capacitance: '10n' });
  const ed = new EditorPage(page);
  await ed.ready();
  await expect(page.getByTestId('review-status')).toContainText('Draft');
  // The starter has no load; draw 1 mA from it and save that as revision 2.
  await ed.selectBlock('load');
  await ed.setField('field-currentA', '1m');
  await page.getByTestId('save-revision').click();
  await page.getByTestId('revision-message').fill('1 mA load');
  await page.getByTestId('save-revision-confirm').click();
  await expect(page.getByTestId('revision-item')).toHaveCount(2);
  await askForReview(page, 'First look at the bias ladder, please');

  // Rue gets the mail, follows its link and lands on revision 2 with the review open.
  const link = await waitForLink(page.request, REVIEWER, `/designs/${designId}?revision=2&review=`);
  const rue = await followAsReviewer(browser, link);
  const red = new EditorPage(rue);
  await red.ready('view');
  await expect(rue.getByTestId('review-status')).toContainText('In review');

  // Rue pins a comment to the output node.
  // Node names come from the compile, so wait for the engine before picking the top output port.
  await red.waitSolved();
  await rue.getByTestId('pin-comment').click();
  await red.handle('s3', 'yOut').click({ force: true });
  await expect(rue.getByTestId('comment-anchor')).toHaveAttribute('data-anchor', 'node:y_s3');
  await rue.getByTestId('comment-body').fill('Ripple here is too high for the detector; larger stage capacitors?');
  await rue.getByTestId('comment-submit').click();
  const thread = rue.getByTestId('comment-thread').filter({ hasText: 'Ripple here is too high' });
  await expect(thread).toHaveAttribute('data-anchor', 'node:y_s3');
  await expect(rue.locator('[data-testid="comment-pin"][data-anchor="node:y_s3"]')).toBeVisible();

  // …and asks for changes.
  await rue.getByTestId('request-changes').click();
  await rue.getByTestId('decision-note').fill('Bring the ripple down: see the comment on the output node.');
  await rue.getByTestId('submit-decision').click();
  await expect(rue.getByTestId('review-status')).toContainText('Changes requested');

  // The designer sees it, changes the bottom smoothing capacitor, saves revision 3 and asks again.
  await page.reload();
  await ed.ready();
  await expect(page.getByTestId('review-status')).toContainText('Changes requested');
  await expect(page.getByTestId('comment-thread').filter({ hasText: 'Ripple here is too high' })).toBeVisible();
  await ed.selectBlock('s1');
  await ed.setField('field-smoothC-capacitanceF', '47n');
  await expect(page.getByTestId('block-s1')).toContainText('47');
  await page.getByTestId('save-revision').click();
  await page.getByTestId('revision-message').fill('Bottom smoothing capacitor 10 nF → 47 nF');
  await page.getByTestId('save-revision-confirm').click();
  await expect(page.getByTestId('revision-item')).toHaveCount(3);
  await askForReview(page, 'Capacitor changed as asked');

  // Rue follows the new mail, compares revision 2 with 3: the changed part and the changed output show.
  const second = await waitForLink(page.request, REVIEWER, `/designs/${designId}?revision=3&review=`);
  await rue.goto(new URL(second).pathname + new URL(second).search);
  await red.ready('view');
  await rue.getByTestId('compare-link').first().click();
  await expect(rue).toHaveURL(new RegExp(`/designs/${designId}/compare\\?`));
  await expect(rue.getByTestId('compare-title')).toContainText('r2 → r3');
  const change = rue.locator('[data-testid="compare-change"][data-block="s1"]');
  await expect(change).toContainText('10 nF → 47 nF');
  const ripple = rue.locator('[data-testid="compare-metric"][data-metric="ripple"]');
  await expect(ripple).toBeVisible();
  // A bigger bottom smoothing capacitor lowers the output ripple (about 29 V → 18 V p-p here).
  expect(Number(await ripple.getAttribute('data-delta'))).toBeLessThan(0);
  await expect(rue.locator('[data-testid="compare-block"][data-change="changed"]')).not.toHaveCount(0);

  // Back on the design, Rue approves revision 3; the approval record names who and which revision.
  await rue.goBack();
  await red.ready('view');
  await rue.getByTestId('approve-review').click();
  await rue.getByTestId('submit-decision').click();
  await expect(rue.getByTestId('review-status')).toContainText('Approved');
  await expect(rue.getByTestId('approval-record')).toContainText('Rue');
  await expect(rue.getByTestId('approval-record')).toContainText('r3');
  await expect(rue.getByTestId('approval-record')).toContainText('does not certify');

  // The designer is told by mail, and the activity feed lists the decision.
  await waitForLink(page.request, DESIGNER, `/designs/${designId}?revision=3&review=`);
  await page.goto('/activity');
  await expect(page.getByTestId('activity-item').filter({ hasText: `approved "${title}" r3` })).toBeVisible();
});
