import type { Locator, Page } from '@playwright/test';
import { expect } from './expect';

/**
 * The design editor as a person drives it: drag blocks from the tray onto the canvas, draw wires
 * from port to port, hover ports, press toolbar buttons. Positions are given in canvas (flow)
 * coordinates and mapped to the screen through the canvas's current pan and zoom.
 */
export class EditorPage {
  constructor(private readonly page: Page) {}

  canvas(): Locator {
    return this.page.getByTestId('editor-canvas');
  }

  async ready(mode: 'edit' | 'view' = 'edit'): Promise<void> {
    await expect(this.page.getByTestId('design-editor')).toBeVisible();
    if (mode === 'edit') await expect(this.page.getByRole('navigation', { name: 'Blocks tray' })).toBeVisible();
  }

  /** Presses the canvas's zoom-out control `times` times. */
  async zoomOut(times: number): Promise<void> {
    for (let i = 0; i < times; i++) {
      const before = (await this.viewport()).zoom;
      await this.page.getByRole('button', { name: 'Zoom Out' }).click();
      await expect.poll(async () => (await this.viewport()).zoom).toBeLessThan(before * 0.95);
    }
    await this.page.waitForTimeout(300);
  }

  /** The canvas's pan and zoom: screen = canvasBox + translate + flow × zoom. */
  async viewport(): Promise<{ tx: number; ty: number; zoom: number }> {
    return this.page.locator('.react-flow__viewport').evaluate((el) => {
      const m = new DOMMatrixReadOnly(getComputedStyle(el).transform);
      return { tx: m.e, ty: m.f, zoom: m.a };
    });
  }

  /** Canvas-relative screen point of a flow point. */
  async toCanvas(p: { x: number; y: number }): Promise<{ x: number; y: number }> {
    const v = await this.viewport();
    return { x: v.tx + p.x * v.zoom, y: v.ty + p.y * v.zoom };
  }

  async blockIds(): Promise<string[]> {
    const ids = await this.page.locator('.react-flow__node [data-testid^="block-"]').evaluateAll((els) => els.map((e) => e.getAttribute('data-testid') ?? ''));
    return ids.map((t) => t.slice('block-'.length));
  }

  /** Drags a tray item onto the canvas so the new block's centre lands on `centre` (flow px); returns the new block's id. */
  async drop(key: string, centre: { x: number; y: number }): Promise<string> {
    const before = new Set(await this.blockIds());
    const target = await this.toCanvas(centre);
    await this.page.getByTestId(`tray-${key}`).dragTo(this.canvas(), { targetPosition: target });
    await expect.poll(async () => (await this.blockIds()).filter((id) => !before.has(id)).length).toBe(1);
    return (await this.blockIds()).filter((id) => !before.has(id))[0];
  }

  handle(blockId: string, port: string): Locator {
    return this.page.locator(`.react-flow__handle[data-nodeid="${blockId}"][data-handleid="${port}"]`);
  }

  async edgeCount(): Promise<number> {
    return this.page.locator('.react-flow__edge').count();
  }

  /** Draws a wire from one port to another with the mouse; returns whether the canvas accepted it. */
  async wire(a: [string, string], b: [string, string]): Promise<boolean> {
    const before = await this.edgeCount();
    const from = await this.handle(...a).boundingBox();
    const to = await this.handle(...b).boundingBox();
    if (!from || !to) throw new Error(`port not on screen: ${a.join('.')} or ${b.join('.')}`);
    await this.page.mouse.move(from.x + from.width / 2, from.y + from.height / 2);
    await this.page.mouse.down();
    await this.page.mouse.move((from.x + to.x) / 2, (from.y + to.y) / 2, { steps: 4 });
    await this.page.mouse.move(to.x + to.width / 2, to.y + to.height / 2, { steps: 4 });
    await this.page.mouse.up();
    await this.page.waitForTimeout(50);
    return (await this.edgeCount()) > before;
  }

  /** Hovers a port and returns the reading card. */
  async hoverPort(blockId: string, port: string): Promise<Locator> {
    await this.handle(blockId, port).hover({ force: true });
    const card = this.page.getByTestId('node-reading');
    await expect(card).toBeVisible();
    return card;
  }

  async waitSolved(timeout = 60_000): Promise<void> {
    await expect(this.page.getByTestId('engine-status')).toHaveAttribute('data-status', 'solved', { timeout });
  }

  async selectBlock(blockId: string): Promise<void> {
    await this.page.getByTestId(`block-${blockId}`).click();
    await expect(this.page.getByTestId('block-inspector')).toHaveAttribute('data-block-id', blockId);
  }

  /** Types a value into an inspector field and commits it with Enter. */
  async setField(testId: string, value: string): Promise<void> {
    const input = this.page.getByTestId(testId);
    await input.fill(value);
    await input.press('Enter');
  }
}
