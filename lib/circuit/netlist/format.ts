/**
 * Writer for the SPICE netlist subset read by `parse.ts`: the inverse of `parseNetlist`, so
 * `parseNetlist(formatNetlist(x))` gives back the same elements and models. Numbers are written
 * with JavaScript's shortest round-trip decimal form (`String(x)`, e.g. `4.7e-9`), which every
 * SPICE reads exactly. `.model` cards come first, then the elements, the kept dot-cards and `.end`.
 */
import type { DiodeModel, Netlist, NetlistElement, SineSpec } from './types';

/** A number in exact SPICE-readable form (shortest decimal that reads back to the same double). */
export function spiceNumber(x: number): string {
  return Object.is(x, -0) ? '0' : String(x);
}

function sineText(s: SineSpec): string {
  const args = [s.offsetV, s.amplitude, s.frequencyHz, s.delayS, s.damping, s.phaseDeg].map(spiceNumber);
  return `SIN(${args.join(' ')})`;
}

function elementText(el: NetlistElement): string {
  const [a, b] = el.nodes;
  switch (el.kind) {
    case 'R':
      return `${el.name} ${a} ${b} ${spiceNumber(el.resistanceOhm)}`;
    case 'C':
      return `${el.name} ${a} ${b} ${spiceNumber(el.capacitanceF)}${el.initialV !== undefined ? ` IC=${spiceNumber(el.initialV)}` : ''}`;
    case 'D':
      return `${el.name} ${a} ${b} ${el.model}${el.area !== undefined ? ` ${spiceNumber(el.area)}` : ''}`;
    case 'V':
      return `${el.name} ${a} ${b} DC ${spiceNumber(el.dcV)}${el.sine ? ` ${sineText(el.sine)}` : ''}`;
    case 'I':
      return `${el.name} ${a} ${b} DC ${spiceNumber(el.dcA)}${el.sine ? ` ${sineText(el.sine)}` : ''}`;
  }
}

function modelText(m: DiodeModel): string {
  const p: string[] = [`IS=${spiceNumber(m.isA)}`, `N=${spiceNumber(m.n)}`, `RS=${spiceNumber(m.rsOhm)}`];
  if (m.bvV !== undefined) p.push(`BV=${spiceNumber(m.bvV)}`);
  p.push(
    `IBV=${spiceNumber(m.ibvA)}`,
    `CJO=${spiceNumber(m.cjoF)}`,
    `VJ=${spiceNumber(m.vjV)}`,
    `M=${spiceNumber(m.m)}`,
    `TT=${spiceNumber(m.ttS)}`,
    `FC=${spiceNumber(m.fc)}`,
  );
  return `.model ${m.name} D(${p.join(' ')})`;
}

/** Write a netlist as SPICE text (title line first, `.end` last). */
export function formatNetlist(netlist: Netlist): string {
  const lines: string[] = [];
  lines.push(netlist.title.replace(/[\r\n]+/g, ' ').trim() || 'Kilorung netlist');
  const models = Object.keys(netlist.models).sort();
  for (const key of models) lines.push(modelText(netlist.models[key]));
  for (const el of netlist.elements) lines.push(elementText(el));
  for (const card of netlist.ignored) lines.push(card.text.replace(/[\r\n]+/g, ' '));
  lines.push('.end');
  return lines.join('\n') + '\n';
}
