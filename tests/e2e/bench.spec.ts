import path from 'node:path';
import { test } from '@playwright/test';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo users and designs (scripts/seed.ts, scripts/seed-bench.ts).
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const DESIGNER = 'dev.designer@tallgrass.test';
const DESIGN = '1.5 kV detector bias ladder';
const fixture = (name: string) => path.join(import.meta.dirname, '../fixtures/bench', name);

test('the demo designer uploads a load curve, maps its columns and sees it over the model with the error per point; a broken file names its lines', async ({ page }) => {
  test.setTimeout(180_000);
  await new SignInPage(page).withPassword(DESIGNER, DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  await new TeamDesignsPage(page).openDesign(DESIGN);

  const panel = page.getByTestId('bench-panel');
  await expect(panel.getByTestId('bench-caution')).toContainText('discharged and grounded');
  // the seeded (invented) dataset is listed and shown
  await expect(panel.getByTestId('bench-dataset').filter({ hasText: 'invented demo data' })).toBeVisible();
  await expect(panel.getByTestId('bench-dataset-view')).toBeVisible({ timeout: 30_000 });

  // upload a semicolon file with decimal commas and µA in the header: the mapping is pre-filled
  await panel.getByTestId('bench-file').setInputFiles(fixture('load-curve-semicolon.csv'));
  const mapping = panel.getByTestId('bench-mapping');
  await expect(mapping).toBeVisible();
  await expect(mapping.getByTestId('bench-layout')).toContainText('7 data rows');
  await expect(mapping.getByTestId('bench-kind')).toHaveValue('loadCurve');
  await expect(mapping.getByTestId('bench-x-column')).toHaveValue('0');
  await expect(mapping.getByTestId('bench-y-column')).toHaveValue('1');
  await expect(mapping.getByTestId('bench-x-unit')).toHaveValue('µA');
  await expect(mapping.getByTestId('bench-y-unit')).toHaveValue('V');
  const name = `E2E bench ${Date.now().toString(36)}`;
  await mapping.getByTestId('bench-name').fill(name);
  await mapping.getByTestId('bench-save').click();

  // the new dataset is selected: the overlay plot and the table of errors
  await expect(panel.getByTestId('bench-dataset').filter({ hasText: name })).toHaveAttribute('aria-pressed', 'true');
  const view = panel.getByTestId('bench-dataset-view');
  await expect(view.getByRole('heading', { name })).toBeVisible({ timeout: 30_000 });
  const plot = view.getByTestId('bench-plot');
  await expect(plot).toHaveAttribute('data-kind', 'loadCurve');
  await expect(plot).toHaveAttribute('data-measured-points', '7');
  await expect(plot).toHaveAttribute('data-model-points', '7');
  await expect(plot.locator('.recharts-scatter-symbol')).toHaveCount(7);
  await expect(plot.locator('.recharts-line-curve')).toHaveCount(1);
  const rows = view.getByTestId('bench-row');
  await expect(rows).toHaveCount(7);
  await expect(rows.first()).toHaveAttribute('data-line', '3');
  // the file was logged about 1 % below the model of r2 (1501.2 V measured at no load)
  for (let i = 0; i < 7; i++) {
    const pct = Number(await rows.nth(i).getAttribute('data-error-pct'));
    expect(pct).toBeLessThan(-0.5);
    expect(pct).toBeGreaterThan(-2);
  }
  // shown in kV (the largest value is above 1 kV): 1501.2 V measured at no load
  await expect(rows.first().locator('td').nth(2)).toHaveText('1.5012');
  await expect(view.getByTestId('bench-summary-slope-model')).toContainText('kΩ');

  // a broken file: the mapping form opens, saving lists each bad line with its reason
  await panel.getByTestId('bench-file').setInputFiles(fixture('load-curve-broken.csv'));
  await expect(mapping).toBeVisible();
  await mapping.getByTestId('bench-save').click();
  const errors = mapping.getByTestId('bench-upload-errors');
  await expect(errors).toBeVisible();
  await expect(errors.getByTestId('bench-error')).toHaveCount(2);
  await expect(errors.getByTestId('bench-error').first()).toHaveText('line 4: "eleven" in column "Vout (kV)" is not a number');
  await expect(errors.getByTestId('bench-error').nth(1)).toContainText('line 6: missing cell');
  // nothing was stored for it
  await expect(panel.getByTestId('bench-dataset').filter({ hasText: 'load-curve-broken' })).toHaveCount(0);

  // a file that is not a measurement log is refused at once, with its line
  await panel.getByTestId('bench-file').setInputFiles({ name: 'notes.csv', mimeType: 'text/csv', buffer: Buffer.from('# just a note\n\n') });
  await expect(panel.getByTestId('bench-inspect-errors')).toContainText('line 1: the file has no data lines');
});
