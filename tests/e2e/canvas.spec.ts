import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { test } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';

test.use({ viewport: { width: 1600, height: 1000 } });

/** Runs `npm run solve` (the CLI) on a file and returns its JSON. */
function cliSolve(file: string): { outputs: { node: string; polarity: string; mean: number }[] } {
  const out = execFileSync('npx', ['tsx', 'scripts/solve.ts', file, '--no-warmup'], { encoding: 'utf8', timeout: 120_000 });
  return JSON.parse(out) as { outputs: { node: string; polarity: string; mean: number }[] };
}

test('a designer builds a 3-stage symmetric ladder from the tray; a colleague opens it read-only, forks it and a heavier load lowers the output', async ({ page, browser }) => {
  test.setTimeout(300_000);
  await new SignInPage(page).withPassword('dev.designer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  const title = `Bipolar bias from the tray ${Date.now().toString(36)}`;
  await new TeamDesignsPage(page).createBlankDesign(title);
  const designUrl = page.url();

  const ed = new EditorPage(page);
  await ed.ready();
  // Room for the whole ladder: zoom out before drawing.
  await ed.zoomOut(2);
  // Layout as a designer would draw it: drive and ground on the left, the positive ladder above,
  // the negative ladder below, the load across the two outputs. Centres in canvas px.
  const src = await ed.drop('ac-source', { x: 70, y: 180 });
  const gnd = await ed.drop('ground', { x: 70, y: 330 });
  const pos: string[] = [];
  const neg: string[] = [];
  for (let k = 0; k < 3; k++) {
    const edgesBefore = await ed.edgeCount();
    pos.push(await ed.drop('stage-half-pos', { x: 310 + 220 * k, y: 40 }));
    // A stage dropped beside the previous one snaps onto its outputs (two wires); otherwise wire it.
    if (k > 0 && (await ed.edgeCount()) === edgesBefore) {
      expect(await ed.wire([pos[k - 1], 'xOut'], [pos[k], 'xIn'])).toBe(true);
      expect(await ed.wire([pos[k - 1], 'yOut'], [pos[k], 'yIn'])).toBe(true);
    }
  }
  for (let k = 0; k < 3; k++) {
    const edgesBefore = await ed.edgeCount();
    neg.push(await ed.drop('stage-half-neg', { x: 310 + 220 * k, y: 460 }));
    if (k > 0 && (await ed.edgeCount()) === edgesBefore) {
      expect(await ed.wire([neg[k - 1], 'xOut'], [neg[k], 'xIn'])).toBe(true);
      expect(await ed.wire([neg[k - 1], 'yOut'], [neg[k], 'yIn'])).toBe(true);
    }
  }
  const load = await ed.drop('load-resistor', { x: 1010, y: 250 });

  // The wires that no snap can guess.
  for (const [a, b] of [
    [[src, 'ret'], [gnd, 'g']],
    [[src, 'hot'], [pos[0], 'xIn']],
    [[gnd, 'g'], [pos[0], 'yIn']],
    [[src, 'hot'], [neg[0], 'xIn']],
    [[gnd, 'g'], [neg[0], 'yIn']],
    [[load, 'a'], [pos[2], 'yOut']],
    [[load, 'b'], [neg[2], 'yOut']],
  ] as [[string, string], [string, string]][]) {
    // A wire the snap already drew is refused as a repeat; the net is what counts.
    await ed.wire(a, b);
  }

  // A wire that makes no sense is refused with a reason.
  await ed.wire([pos[1], 'xIn'], [pos[1], 'xOut']);
  await expect(page.getByTestId('refusal-message')).toBeVisible();
  await expect(page.getByTestId('refusal-message')).toContainText(/short|same|itself|node/i);

  const badge = page.getByTestId('topology-badge');
  await expect(badge).toHaveAttribute('data-kind', 'symmetric');
  await expect(badge).toHaveAttribute('data-stages', '3');
  await expect(badge).toContainText(/symmetric/i);
  await ed.waitSolved();

  // Hovering the positive output shows its DC level.
  const card = await ed.hoverPort(pos[2], 'yOut');
  const hoverMean = Number(await card.getAttribute('data-mean-v'));
  const hoverNode = await card.getAttribute('data-node');
  expect(hoverMean).toBeGreaterThan(1000);

  // The exported netlist, solved by the command line, gives the same level within 0.1 %.
  const download = page.waitForEvent('download');
  await page.getByTestId('export-netlist').click();
  const file = path.join(fs.mkdtempSync(path.join(os.tmpdir(), 'kr-e2e-')), 'bipolar.cir');
  await (await download).saveAs(file);
  const cli = cliSolve(file);
  const cliPositive = cli.outputs.find((o) => o.polarity === 'positive');
  expect(cliPositive?.node).toBe(hoverNode);
  expect(Math.abs(hoverMean - (cliPositive?.mean ?? 0)) / Math.abs(cliPositive?.mean ?? 1)).toBeLessThan(1e-3);

  // Save it as a revision with a message.
  await page.getByTestId('save-revision').click();
  await page.getByTestId('revision-message').fill('Built from the tray: ±3 stages, resistive load');
  await page.getByTestId('save-revision-confirm').click();
  await expect(page.getByTestId('revision-item')).toHaveCount(2);

  // --- a colleague (the team owner) opens it: read-only until they fork it ---
  const ctx = await browser.newContext({ viewport: { width: 1600, height: 1000 } });
  const colleague = await ctx.newPage();
  await new SignInPage(colleague).withPassword('ada.owner@tallgrass.test', DEMO_PASSWORD);
  await colleague.goto(designUrl);
  const theirs = new EditorPage(colleague);
  await theirs.ready('view');
  await expect(colleague.getByTestId('read-only-banner')).toBeVisible();
  await expect(colleague.getByTestId('read-only-banner')).toContainText(/colleague/i);
  await expect(colleague.getByTestId('edit-here')).toBeVisible();
  await expect(colleague.getByRole('navigation', { name: 'Blocks tray' })).toHaveCount(0);
  await expect(colleague.getByTestId('topology-badge')).toHaveAttribute('data-kind', 'symmetric');

  await colleague.getByTestId('fork-design').click();
  await expect(colleague).not.toHaveURL(designUrl);
  await expect(colleague.getByTestId('forked-from')).toContainText(title);
  await theirs.ready('edit');
  await theirs.waitSolved();
  const forkBefore = Number(await (await theirs.hoverPort(pos[2], 'yOut')).getAttribute('data-mean-v'));
  expect(Math.abs(forkBefore - hoverMean) / hoverMean).toBeLessThan(1e-3);

  // A heavier load (a tenth of the resistance) gives a lower output.
  await theirs.selectBlock(load);
  await theirs.setField('field-resistanceOhm', '10meg');
  await theirs.waitSolved();
  const forkAfter = Number(await (await theirs.hoverPort(pos[2], 'yOut')).getAttribute('data-mean-v'));
  expect(forkAfter).toBeLessThan(forkBefore * 0.999);
  await ctx.close();
});
