/**
 * Reference designators of every part in a design document: C1, C2 … for capacitors, D1 … for
 * diodes, R1 … for resistors. They come from the document alone (no compile, no solve), so the
 * canvas, the BOM, the report and the netlist comments all print the same names.
 *
 * The numbering rule (each kind counts on its own, in this order):
 * 1. Stage blocks first, ladder by ladder. A ladder is a chain of stage blocks joined by wires
 *    from one stage's outputs (`xOut`, `x2Out`, `yOut`) to the next one's inputs (`xIn`, `x2In`,
 *    `yIn`). Ladders are taken top to bottom, then left to right, by the position of their first
 *    stage (the one no other stage feeds); ties by block id. Within a ladder, the bottom stage
 *    (stage 1, nearest the drive) first, then up the ladder.
 * 2. Within a stage, column order: capacitors pumping C (driven column), second pumping C
 *    (full-wave), smoothing C; diodes A, B, then C, D (full-wave).
 * 3. Then the single capacitor, diode and resistor blocks, top to bottom, then left to right by
 *    position; ties by block id.
 * A stage that a wire loop makes its own predecessor is numbered as the start of a ladder.
 * Loads, sources, ground and the settings' bleeder are not parts here (no designator).
 *
 * Pure; runs in the browser, the server and the CLI.
 */
import type { CapacitorSpec, DesignBlock, DesignDocument, DiodeSpec } from './schema';

export type DesignatedKind = 'capacitor' | 'diode' | 'resistor';

/** Role of a part inside its block: a stage's part key, or the single part's kind. */
export type DesignatedRole = 'pumpC' | 'pump2C' | 'smoothC' | 'diodeA' | 'diodeB' | 'diodeC' | 'diodeD' | 'capacitor' | 'diode' | 'resistor';

type ResistorData = Extract<DesignBlock, { kind: 'resistor' }>['data'];

/** One designated part: where it sits, what it is, and the spec the compiler uses for it. */
export type DesignatedPart =
  | { designator: string; blockId: string; role: DesignatedRole; kind: 'capacitor'; spec: CapacitorSpec }
  | { designator: string; blockId: string; role: DesignatedRole; kind: 'diode'; spec: DiodeSpec }
  | { designator: string; blockId: string; role: DesignatedRole; kind: 'resistor'; spec: ResistorData };

const PREFIX: Record<DesignatedKind, string> = { capacitor: 'C', diode: 'D', resistor: 'R' };
const OUT_PORTS = new Set(['xOut', 'x2Out', 'yOut']);
const IN_PORTS = new Set(['xIn', 'x2In', 'yIn']);

type Stage = Extract<DesignBlock, { kind: 'stage' }>;

function byPosition(a: DesignBlock, b: DesignBlock): number {
  return a.position.y - b.position.y || a.position.x - b.position.x || (a.id < b.id ? -1 : a.id > b.id ? 1 : 0);
}

/** The stage blocks in ladder order (see the file comment). */
export function stageOrder(doc: Pick<DesignDocument, 'blocks' | 'wires'>): Stage[] {
  const stages = doc.blocks.filter((b): b is Stage => b.kind === 'stage');
  const byId = new Map(stages.map((s) => [s.id, s] as const));
  // predecessor: the stage whose output is wired to this stage's input (first such wire)
  const pred = new Map<string, string>();
  const next = new Map<string, string[]>();
  for (const w of doc.wires) {
    const ends: Array<[string, string, string, string]> = [
      [w.source, w.sourcePort, w.target, w.targetPort],
      [w.target, w.targetPort, w.source, w.sourcePort],
    ];
    for (const [from, fromPort, to, toPort] of ends) {
      if (from === to || !byId.has(from) || !byId.has(to) || !OUT_PORTS.has(fromPort) || !IN_PORTS.has(toPort)) continue;
      if (!pred.has(to)) pred.set(to, from);
      const list = next.get(from) ?? [];
      if (!list.includes(to)) list.push(to);
      next.set(from, list);
    }
  }
  // roots: no predecessor; a stage on a loop with no root joins when nothing else takes it
  const roots = stages.filter((s) => !pred.has(s.id)).sort(byPosition);
  const out: Stage[] = [];
  const seen = new Set<string>();
  const walk = (start: Stage) => {
    const queue = [start];
    while (queue.length > 0) {
      const s = queue.shift() as Stage;
      if (seen.has(s.id)) continue;
      seen.add(s.id);
      out.push(s);
      const children = (next.get(s.id) ?? []).map((id) => byId.get(id) as Stage).filter((c) => !seen.has(c.id) && pred.get(c.id) === s.id);
      queue.push(...children.sort(byPosition));
    }
  };
  for (const r of roots) walk(r);
  for (const s of [...stages].sort(byPosition)) if (!seen.has(s.id)) walk(s);
  return out;
}

/** Every part of `doc` with its designator, in designator order (all C, then D, then R per the rule). */
export function designateParts(doc: Pick<DesignDocument, 'blocks' | 'wires'>): DesignatedPart[] {
  const count: Record<DesignatedKind, number> = { capacitor: 0, diode: 0, resistor: 0 };
  const caps: DesignatedPart[] = [];
  const diodes: DesignatedPart[] = [];
  const resistors: DesignatedPart[] = [];
  const name = (kind: DesignatedKind) => `${PREFIX[kind]}${++count[kind]}`;
  const cap = (blockId: string, role: DesignatedRole, spec: CapacitorSpec) => caps.push({ designator: name('capacitor'), blockId, role, kind: 'capacitor', spec });
  const diode = (blockId: string, role: DesignatedRole, spec: DiodeSpec) => diodes.push({ designator: name('diode'), blockId, role, kind: 'diode', spec });
  for (const s of stageOrder(doc)) {
    const d = s.data;
    const full = d.variant === 'full';
    cap(s.id, 'pumpC', d.pumpC);
    // a full-wave stage without its own second column uses the first column's parts (as the compiler does)
    if (full) cap(s.id, 'pump2C', d.pump2C ?? d.pumpC);
    cap(s.id, 'smoothC', d.smoothC);
    diode(s.id, 'diodeA', d.diodeA);
    diode(s.id, 'diodeB', d.diodeB);
    if (full) {
      diode(s.id, 'diodeC', d.diodeC ?? d.diodeA);
      diode(s.id, 'diodeD', d.diodeD ?? d.diodeB);
    }
  }
  const singles = doc.blocks.filter((b) => b.kind === 'capacitor' || b.kind === 'diode' || b.kind === 'resistor').sort(byPosition);
  for (const b of singles) {
    if (b.kind === 'capacitor') cap(b.id, 'capacitor', b.data);
    else if (b.kind === 'diode') diode(b.id, 'diode', b.data);
    else if (b.kind === 'resistor') resistors.push({ designator: name('resistor'), blockId: b.id, role: 'resistor', kind: 'resistor', spec: b.data });
  }
  return [...caps, ...diodes, ...resistors];
}

/** The key a part is found by: `blockId:role` for a stage's part, `blockId` for a single part. */
export function designatorKey(blockId: string, role: string): string {
  return role === 'capacitor' || role === 'diode' || role === 'resistor' ? blockId : `${blockId}:${role}`;
}

/** Designator by {@link designatorKey}. */
export function designatorMap(doc: Pick<DesignDocument, 'blocks' | 'wires'>): Map<string, string> {
  return new Map(designateParts(doc).map((p) => [designatorKey(p.blockId, p.role), p.designator] as const));
}

/** Natural order of designators: by letter prefix, then by number (C2 before C10). */
export function compareDesignators(a: string, b: string): number {
  const ma = /^([A-Za-z]*)(\d*)(.*)$/.exec(a) as RegExpExecArray;
  const mb = /^([A-Za-z]*)(\d*)(.*)$/.exec(b) as RegExpExecArray;
  if (ma[1] !== mb[1]) return ma[1] < mb[1] ? -1 : 1;
  const na = ma[2] === '' ? -1 : Number(ma[2]);
  const nb = mb[2] === '' ? -1 : Number(mb[2]);
  if (na !== nb) return na - nb;
  return ma[3] < mb[3] ? -1 : ma[3] > mb[3] ? 1 : 0;
}
