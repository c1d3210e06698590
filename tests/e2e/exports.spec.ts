import { execFileSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { test } from '@playwright/test';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

// Seeded demo users and designs (scripts/seed.ts).
const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';
const VIEWER = 'val.viewer@tallgrass.test';
const DESIGN = '1.5 kV detector bias ladder';

test('a viewer opens the demo bias ladder, sees the designators on the canvas, downloads the BOM and the report and finds the tables in it', async ({ page }) => {
  test.setTimeout(180_000);
  await new SignInPage(page).withPassword(VIEWER, DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  await new TeamDesignsPage(page).openDesign(DESIGN);
  await expect(page.getByTestId('design-editor')).toBeVisible();

  // the latest revision (r2) has 4 half-wave stages: C1–C8 and D1–D8 on the canvas
  const canvas = page.getByTestId('editor-canvas');
  await expect(canvas.getByTestId('designator-C1')).toBeAttached();
  await expect(canvas.getByTestId('designator-C8')).toBeAttached();
  await expect(canvas.getByTestId('designator-D8')).toBeAttached();
  await expect(canvas.getByTestId('designator-C9')).toHaveCount(0);
  await expect(page.getByTestId('block-s1').getByTestId('designator-C1')).toBeAttached();

  const panel = page.getByTestId('downloads-panel');
  await expect(panel).toContainText('r2');
  await expect(panel.getByTestId('downloads-caution')).toContainText('lethal charge');
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'kr-e2e-exports-'));

  // BOM: one row of 8 capacitors, one of 8 diodes, and the total
  const [bom] = await Promise.all([page.waitForEvent('download'), panel.getByTestId('download-bom').click()]);
  expect(bom.suggestedFilename()).toBe('1-5-kv-detector-bias-ladder-r2-bom.csv');
  const bomFile = path.join(dir, 'bom.csv');
  await bom.saveAs(bomFile);
  const lines = fs.readFileSync(bomFile, 'utf8').split('\r\n').filter((l) => l !== '');
  expect(lines[0]).toMatch(/^Designators,Quantity,Kind,Part number,Maker,Value,Tolerance,Ratings,Worst stress,Margin,Unit cost,Line cost,Currency$/);
  expect(lines[1]).toMatch(/^C1 C2 C3 C4 C5 C6 C7 C8,8,capacitor,unbound,,10 nF,/);
  expect(lines[2]).toMatch(/^D1 D2 D3 D4 D5 D6 D7 D8,8,diode,generic-rect-1k,/);
  expect(lines[lines.length - 1]).toMatch(/^Total,16,/);

  // report: saved, then read with pdftotext (Debian's poppler-utils)
  const [report] = await Promise.all([page.waitForEvent('download', { timeout: 60_000 }), panel.getByTestId('download-pdf').click()]);
  expect(report.suggestedFilename()).toBe('1-5-kv-detector-bias-ladder-r2-report.pdf');
  const pdfFile = path.join(dir, 'report.pdf');
  await report.saveAs(pdfFile);
  expect(fs.readFileSync(pdfFile).subarray(0, 5).toString('latin1')).toBe('%PDF-');
  const text = execFileSync('pdftotext', ['-layout', pdfFile, '-'], { encoding: 'utf8' });
  for (const heading of ['Requirement vs result', 'Per-node readings', 'Per-part stress', 'Waveforms', 'Safety', 'Revision and approval record']) expect(text).toContain(heading);
  expect(text).toMatch(/Designator\s+Part\s+Check\s+Stress\s+Rating\s+Derated limit\s+Margin\s+Status/);
  expect(text).toMatch(/Node\s+Net\s+Mean V\s+Ripple p-p/);
  expect(text).toMatch(/^\s*D8\s+Stage 4 · diode B/m);
  expect(text).toMatch(/lethal stored charge/i);
  expect(text).toContain('Tallgrass Instruments');

  // netlist and JSON links answer files too
  const [net] = await Promise.all([page.waitForEvent('download'), panel.getByTestId('download-netlist').click()]);
  expect(net.suggestedFilename()).toBe('1-5-kv-detector-bias-ladder-r2-netlist.cir');
  const [json] = await Promise.all([page.waitForEvent('download'), panel.getByTestId('download-json').click()]);
  const jsonFile = path.join(dir, 'design.json');
  await json.saveAs(jsonFile);
  expect(JSON.parse(fs.readFileSync(jsonFile, 'utf8')).schemaVersion).toBe(1);
  fs.rmSync(dir, { recursive: true, force: true });
});
