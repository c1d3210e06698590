import { test } from '@playwright/test';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo data (scripts/seed.ts); the password is the one the README and `npm run app` print.
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const DESIGN = '30 kV precipitator test ladder';

test('a viewer runs a 40-sample tolerance spread: the progress bar moves and the result shows its percentiles', async ({ page }) => {
  test.setTimeout(150_000);
  await new SignInPage(page).withPassword('val.viewer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  await new TeamDesignsPage(page).openDesign(DESIGN);

  const panel = page.getByTestId('analyses-panel');
  await expect(panel).toBeVisible();
  await panel.getByTestId('analysis-kind').selectOption('spread');
  await panel.getByTestId('analysis-samples').fill('40');
  await panel.getByTestId('analysis-seed').fill('20261202');
  await panel.getByTestId('analysis-run').click();

  // The bar belongs to this run; read it while the worker computes.
  const bar = panel.getByTestId('analysis-progress');
  await expect(bar).toBeVisible();
  const seen = new Set<number>();
  const view = panel.getByTestId('analysis-run-view');
  await expect
    .poll(
      async () => {
        // status and bar read in one step: read one after the other, the bar could go (the run
        // finished in between) and the read would wait for it until the poll gave up
        const { status, now } = await view.evaluate((el) => ({
          status: el.getAttribute('data-status'),
          now: el.querySelector('[data-testid="analysis-progress"]')?.getAttribute('aria-valuenow') ?? null,
        }));
        if (now !== null) seen.add(Number(now));
        return status === 'done' ? 'done' : 'running';
      },
      { timeout: 120_000, intervals: [200] },
    )
    .toBe('done');
  // It moved: some value strictly between 0 and 100 was shown on the way.
  expect([...seen].some((v) => v > 0 && v < 100)).toBe(true);

  await expect(panel.getByTestId('analysis-status')).toHaveText('done');
  await expect(panel.getByTestId('spread-plot-output')).toBeVisible();
  await expect(panel.getByTestId('spread-plot-ripple')).toBeVisible();
  const table = panel.getByTestId('spread-table');
  await expect(table).toContainText('40 samples');
  const p5 = Number(await table.getByTestId('spread-output-p5').getAttribute('data-value'));
  const p50 = Number(await table.getByTestId('spread-output-p50').getAttribute('data-value'));
  const p95 = Number(await table.getByTestId('spread-output-p95').getAttribute('data-value'));
  // A loaded 6-stage ladder from 2.5 kV peak: below its ideal 30 kV, percentiles in order.
  expect(p5).toBeGreaterThan(1000);
  expect(p5).toBeLessThan(p50);
  expect(p50).toBeLessThan(p95);
  expect(p95).toBeLessThan(30_000);
  await expect(table.getByTestId('spread-output-p50')).toHaveText(/kV$/);

  // The run is listed, and reading it again after a reload shows the same result.
  await expect(panel.getByTestId('analysis-list')).toContainText('Spread · 40 samples · seed 20261202');
  await page.reload();
  await expect(page.getByTestId('analyses-panel').getByTestId('spread-output-p50')).toHaveAttribute('data-value', String(p50));
});
