import fs from 'node:fs';
import { test } from '@playwright/test';
import { EditorPage } from './support/editor';
import { expect } from './support/expect';
import { SignInPage, TeamDesignsPage, TeamsPage } from './support/pages';

const DEMO_PASSWORD = 'kilorung-demo-1';
const TEAM = 'Tallgrass Instruments';

test.use({ viewport: { width: 1600, height: 1000 } });

/** A 2-stage half-wave ladder as a hand-written SPICE-subset netlist (node names of our own). */
const IMPORTED_NETLIST = `two-stage ladder typed by hand
V1 drv 0 SIN(0 1k 20k)
Cp1 drv xa 10n
Da 0 xa RECT
Cs1 0 ya 10n
Db xa ya RECT
Cp2 xa xb 10n
Dc ya xb RECT
Cs2 ya yb 10n
Dd xb yb RECT
Rload yb 0 100meg
.model RECT D(IS=2.5n N=1.75 RS=0.05)
.end
`;

test('a designer grows a starter, undoes and redoes, is stopped at a bad value, saves, and meets a colleague’s newer save', async ({ page }) => {
  test.setTimeout(240_000);
  await new SignInPage(page).withPassword('dev.designer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  const title = `Comforts ${Date.now().toString(36)}`;
  const designId = await new TeamDesignsPage(page).createDesign({ title, starter: 'half-wave', stages: 2, amplitude: '1k', frequency: '20k', capacitance: '10n' });
  const ed = new EditorPage(page);
  await ed.ready();
  const badge = page.getByTestId('topology-badge');
  await expect(badge).toHaveAttribute('data-kind', 'half-wave');
  await expect(badge).toHaveAttribute('data-stages', '2');

  // "n more stages" is one action; undo and redo step over it.
  await page.getByTestId('append-count').fill('2');
  await page.getByTestId('append-stages').click();
  await expect(badge).toHaveAttribute('data-stages', '4');
  await page.getByTestId('undo').click();
  await expect(badge).toHaveAttribute('data-stages', '2');
  await page.getByTestId('redo').click();
  await expect(badge).toHaveAttribute('data-stages', '4');
  await ed.waitSolved();

  // A bad value is flagged at the field and never reaches the solver.
  await ed.selectBlock('s1');
  const version = await page.getByTestId('design-editor').getAttribute('data-version');
  await ed.setField('field-pumpC-capacitanceF', 'ten nano');
  await expect(page.getByTestId('block-inspector').getByRole('alert')).toBeVisible();
  await expect(page.getByTestId('design-editor')).toHaveAttribute('data-version', version ?? '');
  await ed.setField('field-pumpC-capacitanceF', '22n');
  await expect(page.getByTestId('design-editor')).not.toHaveAttribute('data-version', version ?? '');
  await expect(page.getByTestId(`block-s1`)).toContainText('22');

  // The shortcut list opens with "?".
  await page.getByTestId('editor-canvas').click({ position: { x: 10, y: 10 } });
  await page.keyboard.press('?');
  await expect(page.getByTestId('help-sheet')).toBeVisible();
  await expect(page.getByTestId('help-sheet')).toContainText(/undo/i);
  await page.keyboard.press('Escape');
  await expect(page.getByTestId('help-sheet')).toBeHidden();

  // Save a revision with a message.
  await page.getByTestId('save-revision').click();
  await page.getByTestId('revision-message').fill('Four stages, 22 nF at the bottom');
  await page.getByTestId('save-revision-confirm').click();
  await expect(page.getByTestId('revision-item')).toHaveCount(2);

  // A colleague saves first (through the API, as their editor would): our next save is refused.
  const latest = (await (await page.request.get(`/api/designs/${designId}`)).json()) as { revision: { number: number; document: { blocks: { id: string; kind: string; data: Record<string, unknown> }[] } } };
  expect(latest.revision.number).toBe(2);
  const theirs = structuredClone(latest.revision.document);
  const theirLoad = theirs.blocks.find((b) => b.kind === 'load');
  if (theirLoad) theirLoad.data = { mode: 'resistor', resistanceOhm: 50e6 };
  const saved = await page.request.post(`/api/designs/${designId}/revisions`, { data: { baseRevision: 2, document: theirs, message: 'heavier load' } });
  expect(saved.status()).toBe(201);

  await page.getByTestId('append-count').fill('1');
  await page.getByTestId('append-stages').click();
  await expect(badge).toHaveAttribute('data-stages', '5');
  await page.getByTestId('save-revision').click();
  await page.getByTestId('revision-message').fill('Five stages');
  await page.getByTestId('save-revision-confirm').click();
  const conflict = page.getByTestId('conflict-banner');
  await expect(conflict).toBeVisible();
  await expect(conflict).toHaveAttribute('data-latest-revision', '3');
  await page.getByTestId('conflict-compare').click();
  await expect(page.getByTestId('conflict-diff')).toBeVisible();
  await page.getByTestId('conflict-reload').click();
  await expect(conflict).toBeHidden();
  await expect(badge).toHaveAttribute('data-stages', '4');

  // Export the design JSON; import a hand-written netlist, laid out automatically.
  const jsonDownload = page.waitForEvent('download');
  await page.getByTestId('export-json').click();
  const json = JSON.parse(fs.readFileSync(await (await jsonDownload).path(), 'utf8')) as { title: string; document: { blocks: { kind: string }[] } };
  expect(json.title).toBe(title);
  expect(json.document.blocks.filter((b) => b.kind === 'stage')).toHaveLength(4);

  await page.getByTestId('import-file-input').setInputFiles({ name: 'by-hand.cir', mimeType: 'text/plain', buffer: Buffer.from(IMPORTED_NETLIST) });
  await expect(badge).toHaveAttribute('data-kind', 'half-wave');
  await expect(badge).toHaveAttribute('data-stages', '2');
  await ed.waitSolved();
  // 2 stages at 1 kV peak: close to the ideal 4 kV at this light load.
  const loadId = (await ed.blockIds()).find((id) => id.startsWith('load'));
  expect(loadId).toBeTruthy();
  const out = await ed.hoverPort(loadId as string, 'a');
  expect(Number(await out.getAttribute('data-mean-v'))).toBeGreaterThan(3800);

  // A picture of the drawing.
  const png = page.waitForEvent('download');
  await page.getByTestId('export-png').click();
  const bytes = fs.readFileSync(await (await png).path());
  expect(bytes.subarray(1, 4).toString('latin1')).toBe('PNG');
  expect(bytes.length).toBeGreaterThan(2000);
});

test('a viewer opens a design read-only: no tray, no edits, but hover readings and exports work', async ({ page }) => {
  await new SignInPage(page).withPassword('val.viewer@tallgrass.test', DEMO_PASSWORD);
  await new TeamsPage(page).openTeam(TEAM);
  const title = ((await page.getByTestId('design-link').first().textContent()) ?? '').trim();
  await new TeamDesignsPage(page).openDesign(title);
  const ed = new EditorPage(page);
  await ed.ready('view');
  await expect(page.getByTestId('read-only-banner')).toBeVisible();
  await expect(page.getByRole('navigation', { name: 'Blocks tray' })).toHaveCount(0);
  await expect(page.getByTestId('save-revision')).toHaveCount(0);
  await ed.waitSolved();
  const version = await page.getByTestId('design-editor').getAttribute('data-version');
  await page.keyboard.press('Control+a');
  await page.keyboard.press('Delete');
  await expect(page.getByTestId('design-editor')).toHaveAttribute('data-version', version ?? '');
  const download = page.waitForEvent('download');
  await page.getByTestId('export-netlist').click();
  const text = fs.readFileSync(await (await download).path(), 'utf8');
  expect(text).toMatch(/^\.end\s*$/m);
});
