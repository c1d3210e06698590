/**
 * Block sizes and port anchor points on the canvas (px, relative to the block's top-left
 * `position`). The canvas draws each port's handle exactly at its anchor, and the ladder
 * operations (snapping, growing a ladder) work with the same numbers, so both agree.
 *
 * Drawing convention of a stage block (the ladder is read left to right, stage 1 first):
 * - inputs on the left edge, outputs on the right edge, each output at the height of its input;
 * - the driven (pumping) column on top (`xIn` → `xOut`), the antiphase driven column of a
 *   full-wave stage in the middle (`x2In` → `x2Out`), the smoothing column at the bottom
 *   (`yIn` → `yOut`);
 * - a stage is {@link STAGE_WIDTH} wide, the starters' horizontal stage pitch, so the outputs of
 *   stage k sit on the same canvas points as the inputs of stage k+1 when stages are chained.
 *
 * Sources put their hot output(s) on the right edge at the driven-column heights of a stage
 * placed beside them at the same `y`, and their return (or centre tap) on the bottom edge. A load
 * takes the output on its left edge at the smoothing-column height of a half-wave stage and
 * returns on its bottom edge; ground has one port on its top edge. Single parts are drawn
 * horizontally with one end on each side.
 */
import type { DesignBlock } from './schema';

/** Side of the block a port's handle sits on. */
export type PortSide = 'left' | 'right' | 'top' | 'bottom';

/** Where a port is drawn: `x`, `y` in px from the block's top-left corner. */
export interface PortAnchor {
  port: string;
  x: number;
  y: number;
  side: PortSide;
}

/** Width of a stage block (px); equal to the starters' stage pitch so chained ports coincide. */
export const STAGE_WIDTH = 220;
/** Height of a half-wave stage block (px). */
export const HALF_STAGE_HEIGHT = 160;
/** Height of a full-wave stage block (px). */
export const FULL_STAGE_HEIGHT = 200;

/** Port heights inside a stage block (px from its top edge). */
const STAGE_ROW = { x: 30, x2: 100, yHalf: 130, yFull: 170 } as const;

const SOURCE_WIDTH = 140;
const SOURCE_HEIGHT = 120;
const CT_SOURCE_HEIGHT = 160;
const LOAD_WIDTH = 80;
const LOAD_HEIGHT = 100;
const GROUND_WIDTH = 60;
const GROUND_HEIGHT = 40;
const PART_WIDTH = 100;
const PART_HEIGHT = 60;

/** Drawn size of a block (px). */
export function blockSize(block: DesignBlock): { width: number; height: number } {
  switch (block.kind) {
    case 'stage':
      return { width: STAGE_WIDTH, height: block.data.variant === 'full' ? FULL_STAGE_HEIGHT : HALF_STAGE_HEIGHT };
    case 'acSource':
      return { width: SOURCE_WIDTH, height: block.data.variant === 'centreTapped' ? CT_SOURCE_HEIGHT : SOURCE_HEIGHT };
    case 'dcSource':
      return { width: SOURCE_WIDTH, height: SOURCE_HEIGHT };
    case 'load':
      return { width: LOAD_WIDTH, height: LOAD_HEIGHT };
    case 'ground':
      return { width: GROUND_WIDTH, height: GROUND_HEIGHT };
    case 'capacitor':
    case 'resistor':
    case 'diode':
      return { width: PART_WIDTH, height: PART_HEIGHT };
  }
}

/** Anchor of every port of the block (same ports, same order as `portsOf`), relative to its top-left corner. */
export function portAnchors(block: DesignBlock): PortAnchor[] {
  const { width, height } = blockSize(block);
  switch (block.kind) {
    case 'stage': {
      const yRow = block.data.variant === 'full' ? STAGE_ROW.yFull : STAGE_ROW.yHalf;
      const inOut = (column: string, y: number): PortAnchor[] => [
        { port: `${column}In`, x: 0, y, side: 'left' },
        { port: `${column}Out`, x: width, y, side: 'right' },
      ];
      const [xIn, xOut] = inOut('x', STAGE_ROW.x);
      const [yIn, yOut] = inOut('y', yRow);
      if (block.data.variant === 'half') return [xIn, yIn, xOut, yOut];
      const [x2In, x2Out] = inOut('x2', STAGE_ROW.x2);
      return [xIn, x2In, yIn, xOut, x2Out, yOut];
    }
    case 'acSource':
      return block.data.variant === 'single'
        ? [
            { port: 'hot', x: width, y: STAGE_ROW.x, side: 'right' },
            { port: 'ret', x: width / 2, y: height, side: 'bottom' },
          ]
        : [
            { port: 'hot', x: width, y: STAGE_ROW.x, side: 'right' },
            { port: 'ct', x: width / 2, y: height, side: 'bottom' },
            { port: 'hotB', x: width, y: STAGE_ROW.x2, side: 'right' },
          ];
    case 'dcSource':
      return [
        { port: 'pos', x: width, y: STAGE_ROW.x, side: 'right' },
        { port: 'neg', x: width / 2, y: height, side: 'bottom' },
      ];
    case 'load':
      return [
        { port: 'a', x: 0, y: STAGE_ROW.x, side: 'left' },
        { port: 'b', x: width / 2, y: height, side: 'bottom' },
      ];
    case 'ground':
      return [{ port: 'g', x: width / 2, y: 0, side: 'top' }];
    case 'capacitor':
    case 'resistor':
      return [
        { port: 'a', x: 0, y: height / 2, side: 'left' },
        { port: 'b', x: width, y: height / 2, side: 'right' },
      ];
    case 'diode':
      return [
        { port: 'anode', x: 0, y: height / 2, side: 'left' },
        { port: 'cathode', x: width, y: height / 2, side: 'right' },
      ];
  }
}

/** Canvas position (px) of one port of a block, or null when the block has no such port. */
export function portPosition(block: DesignBlock, port: string): { x: number; y: number } | null {
  const anchor = portAnchors(block).find((a) => a.port === port);
  return anchor ? { x: block.position.x + anchor.x, y: block.position.y + anchor.y } : null;
}
