import { test, type Page } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { SignInPage, TeamsPage } from './support/pages';

// Seeded demo data (scripts/seed.ts and the parts seed): team Tallgrass Instruments, the
// designer's 4-stage detector bias ladder (diodes rated 1 kV PIV, about 380 V reverse at 190 V peak).
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const TEAM_ID = '00000002-5eed-4000-8000-000000000001';
const BIAS = '00000003-5eed-4000-8000-000000000002';
const DESIGNER = 'dev.designer@tallgrass.test';
const VIEWER = 'val.viewer@tallgrass.test';
const OWNER = 'ada.owner@tallgrass.test';

/** An invented 400 V rectifier with the demo ladder's own diode model, so only the rating differs. */
function lowPivDiode(partNumber: string) {
  return {
    kind: 'diode',
    partNumber,
    maker: 'E2E Test Works',
    description: 'invented test part: 400 V rectifier',
    specs: { ratedPivV: 400, ratedAvgCurrentA: 1, model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05 } },
  };
}

function stressRow(page: Page, element: string, quantity: string) {
  return page.locator(`[data-testid="stress-table"] tr[data-element="${element}"][data-quantity="${quantity}"]`);
}

test('a designer searches the team library, binds a lower-PIV diode and sees its stress margin go over', async ({ page }) => {
  test.setTimeout(180_000);
  await new SignInPage(page).withPassword(DESIGNER, DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  await page.getByTestId('team-parts-link').click();
  await expect(page).toHaveURL(new RegExp(`/teams/${TEAM_ID}/parts$`));
  await expect(page.getByTestId('parts-library')).toHaveAttribute('data-can-edit', 'true');

  // The demo parts are there; a search for one part number narrows the list to matching rows.
  const rows = page.getByTestId('part-row');
  await expect(rows.first()).toBeVisible();
  const all = await rows.count();
  expect(all).toBeGreaterThan(1);
  const number = (await rows.last().getAttribute('data-part-number')) ?? '';
  await page.getByTestId('parts-search').fill(number);
  await expect(rows.filter({ hasText: number }).first()).toBeVisible();
  await expect.poll(async () => (await rows.evaluateAll((els) => els.map((e) => e.textContent ?? ''))).every((t) => t.toLowerCase().includes(number.toLowerCase()))).toBe(true);
  await page.getByTestId('parts-search').fill('');
  await page.getByTestId('parts-kind').selectOption('diode');
  await expect.poll(async () => new Set(await rows.evaluateAll((els) => els.map((e) => e.getAttribute('data-kind'))))).toEqual(new Set(['diode']));

  // A 400 V diode, made through the API (the server's own validation and roles).
  const partNumber = `E2E-D400-${Date.now().toString(36)}`;
  const made = await page.request.post(`/api/teams/${TEAM_ID}/parts`, { data: lowPivDiode(partNumber) });
  expect(made.status()).toBe(201);

  await page.goto(`/designs/${BIAS}`);
  const ed = new EditorPage(page);
  await ed.ready();
  await ed.waitSolved();
  const fraction = Number(await page.getByTestId('stress-derating').getAttribute('data-fraction'));
  expect(fraction).toBeGreaterThan(0.4);
  expect(fraction).toBeLessThanOrEqual(1);
  const piv = stressRow(page, 'DA_s1', 'Peak inverse voltage');
  await expect(piv).toHaveAttribute('data-status', /ok|tight/);
  const before = Number(await piv.getAttribute('data-margin'));
  // margin = (fraction · 1000 V − PIV) / (fraction · 1000 V): the PIV the solve found.
  const pivV = fraction * 1000 * (1 - before);
  expect(pivV).toBeGreaterThan(300);

  await ed.selectBlock('s1');
  await page.getByTestId('inspector-diodeA').locator('summary').click();
  await page.getByTestId('field-diodeA-use-library').click();
  await page.getByTestId('field-diodeA-picker-search').fill(partNumber);
  await page.getByTestId('library-part-option').filter({ hasText: partNumber }).click();
  await expect(page.getByTestId('field-diodeA-bound-part')).toHaveText(partNumber);
  await expect(page.getByTestId('field-diodeA-ratedPivV')).toHaveValue('400');

  // Same model, so the same PIV; the 400 V rating puts it over the derated limit.
  await ed.waitSolved();
  await expect(piv).toHaveAttribute('data-status', 'over');
  const after = Number(await piv.getAttribute('data-margin'));
  expect(after).toBeCloseTo((fraction * 400 - pivV) / (fraction * 400), 3);
  await expect(page.locator('[data-testid="stress-part"][data-block-id="s1"]').first()).toBeVisible();
  await expect(page.getByTestId('stress-part-number').filter({ hasText: partNumber })).toBeVisible();
  await expect(page.getByTestId('stress-summary')).toContainText('over the derated limit');
  // The canvas flags the diode symbol in the hazard colour.
  await expect.poll(() => page.getByTestId('block-s1').getByTestId('sym-diodeA').innerHTML()).toContain('#d93a3a');

  // A hand edit of a copied value unbinds; undo brings the binding back, one step at a time.
  await ed.setField('field-diodeA-ratedPivV', '2k');
  await expect(page.getByTestId('field-diodeA-binding')).toHaveAttribute('data-part-id', '');
  await page.getByTestId('undo').click();
  await expect(page.getByTestId('field-diodeA-bound-part')).toHaveText(partNumber);
  await page.getByTestId('undo').click();
  await expect(page.getByTestId('field-diodeA-binding')).toHaveAttribute('data-bound-part-number', '');
  await ed.waitSolved();
  await expect(piv).toHaveAttribute('data-status', /ok|tight/);
});

test('a viewer sees the library read-only, and the server refuses a viewer’s new part', async ({ page }) => {
  test.setTimeout(120_000);
  await new SignInPage(page).withPassword(VIEWER, DEMO_PASSWORD);
  await page.goto(`/teams/${TEAM_ID}/parts`);
  await expect(page.getByTestId('part-row').first()).toBeVisible();
  await expect(page.getByTestId('parts-library')).toHaveAttribute('data-can-edit', 'false');
  await expect(page.getByTestId('parts-role-note')).toContainText('read-only');
  await expect(page.getByTestId('new-part')).toHaveCount(0);
  await expect(page.getByTestId('parts-import')).toHaveCount(0);
  await expect(page.getByTestId('part-edit')).toHaveCount(0);
  await expect(page.getByTestId('datasheet-upload')).toHaveCount(0);
  await expect(page.getByTestId('policy-read-only')).toBeVisible();
  const refused = await page.request.post(`/api/teams/${TEAM_ID}/parts`, { data: lowPivDiode(`E2E-VIEW-${Date.now().toString(36)}`) });
  expect(refused.status()).toBe(403);

  // In the editor the viewer sees no binding controls.
  await page.goto(`/designs/${BIAS}`);
  const ed = new EditorPage(page);
  await ed.ready('view');
  await ed.selectBlock('s1');
  await expect(page.getByTestId('field-pumpC-binding')).toBeVisible();
  await expect(page.getByTestId('field-pumpC-use-library')).toHaveCount(0);
});

test('the owner’s derating policy is what the design’s stress table judges at', async ({ page }) => {
  test.setTimeout(180_000);
  await new SignInPage(page).withPassword(OWNER, DEMO_PASSWORD);
  const was = ((await (await page.request.get(`/api/teams/${TEAM_ID}/parts-policy`)).json()) as { policy: { deratingFraction: number } }).policy.deratingFraction;
  try {
    await page.goto(`/teams/${TEAM_ID}/parts`);
    await page.getByTestId('policy-input').fill('50');
    await page.getByTestId('policy-save').click();
    await expect(page.getByTestId('policy-fraction')).toHaveAttribute('data-fraction', '0.5');
    // The owner opens the designer's ladder to view (a colleague's design opens read-only).
    await page.goto(`/designs/${BIAS}`);
    const ed = new EditorPage(page);
    await ed.ready('view');
    await ed.waitSolved();
    await expect(page.getByTestId('stress-derating')).toHaveAttribute('data-fraction', '0.5');
    await expect(page.getByTestId('stress-derating')).toContainText('50 % of rating (team policy)');
    const limit = page.locator('[data-testid="stress-table"] tr[data-element="DA_s1"][data-quantity="Peak inverse voltage"] td').nth(3);
    await expect(limit).toContainText('500');
  } finally {
    const put = await page.request.put(`/api/teams/${TEAM_ID}/parts-policy`, { data: { deratingFraction: was } });
    expect(put.status()).toBe(200);
  }
});
