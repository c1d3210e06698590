/**
 * Topology recognition on the netlist graph itself (any node names, so an imported SPICE netlist
 * is recognised as well as a compiled canvas). Method: series resistors that only feed one other
 * element (source resistance, capacitor ESR) are contracted away; every grounded sine source
 * gives a drive node; from each drive node a Cockcroft–Walton ladder is walked stage by stage.
 * Stage k of a half-wave ladder (column convention of the Greinacher/Cockcroft–Walton cascade,
 * REFERENCES §1) is the pumping capacitor x(k−1)→x(k), the smoothing capacitor y(k−1)→y(k) and
 * the diodes y(k−1)–x(k) and x(k)–y(k), with x(0) the drive node and y(0) ground. A stage is
 * accepted when at least three of its four parts are found, so a missing or reversed part is
 * diagnosed on its stage instead of making the whole circuit "custom". A second antiphase drive
 * whose column feeds the same smoothing column makes the ladder full-wave (§2); two
 * opposite-polarity half-wave ladders about ground make the symmetric (bipolar) pair (§3).
 */
import { GROUND, type CapacitorElement, type Netlist, type NetlistElement } from '../netlist/types';
import { attachOrigins, type Diagnostic } from './diagnostics';
import { estimateLadder } from '../estimates/estimate';

/** Sign of a ladder's output relative to ground. */
export type Polarity = 'positive' | 'negative';
/** Recognised shape of the whole circuit (REFERENCES §1–§3); `custom` is solved but not labelled. */
export type TopologyKind = 'half-wave' | 'full-wave' | 'symmetric' | 'custom';
/** Column a node belongs to: driven (pumping) x, antiphase driven x2, smoothing y, ground, source, other. */
export type ColumnRole = 'driven' | 'driven2' | 'smoothing' | 'ground' | 'source' | 'other';

/** Parts found in one stage (element names; absent = missing). */
export interface StageElements {
  /** 1-based, bottom stage first. */
  stage: number;
  pumpC?: string;
  smoothC?: string;
  pump2C?: string;
  /** Diodes in order A (y(k−1)–x(k)), B (x(k)–y(k)) and, full-wave, C, D. */
  diodes: string[];
}

/** One recognised ladder: its columns, parts per stage, drive and load (node and element names of the netlist). */
export interface LadderReport {
  variant: 'half-wave' | 'full-wave';
  polarity: Polarity;
  stages: number;
  /** Top of the smoothing column. */
  outputNode: string;
  /** Drive node feeding the driven column (x0). */
  driveNode: string;
  /** x1..xn (stage k at index k−1). */
  drivenColumn: string[];
  /** y1..yn (stage k at index k−1); y0 is ground. */
  smoothingColumn: string[];
  /** x2(1)..x2(n) of the antiphase column (full-wave). */
  secondDrivenColumn?: string[];
  secondDriveNode?: string;
  /** Voltage sources (and their contracted series resistors) driving this ladder. */
  sourceElements: string[];
  stageElements: StageElements[];
  /** Drive amplitude (V, peak) and frequency (Hz) of the source feeding this ladder. */
  drivePeakV: number;
  frequencyHz: number;
  /** Estimated DC current drawn from the output (A), from I loads and R loads at no-load voltage. */
  loadCurrentA: number;
  /** Load elements found at the output. */
  loadElements: string[];
}

/** Result of topology recognition; voltages in V, frequency in Hz. */
export interface TopologyReport {
  kind: TopologyKind;
  ladders: LadderReport[];
  outputs: Array<{ node: string; polarity: Polarity }>;
  columnOf: Record<string, ColumnRole>;
  stageOf: Record<string, number>;
  drivePeakV?: number;
  frequencyHz?: number;
  /** Capacitors from a ladder node to ground that are not part of a stage (stray capacitance). */
  strayCapacitors: string[];
  diagnostics: Diagnostic[];
}

interface Drive {
  node: string;
  amplitudeV: number;
  phaseDeg: number;
  frequencyHz: number;
  elements: string[];
}

const MAX_PER_CODE = 20;

class Graph {
  /** Element nodes after series-resistor contraction, resolved once. */
  private readonly resolved: Array<[string, string]>;
  readonly adj = new Map<string, number[]>();
  constructor(
    readonly elements: NetlistElement[],
    contracted: Set<number>,
    private readonly rep: Map<string, string>,
  ) {
    this.resolved = elements.map((el) => [this.find(el.nodes[0]), this.find(el.nodes[1])]);
    elements.forEach((_, i) => {
      if (contracted.has(i)) return;
      const [a, b] = this.resolved[i];
      for (const node of a === b ? [a] : [a, b]) {
        let list = this.adj.get(node);
        if (!list) this.adj.set(node, (list = []));
        list.push(i);
      }
    });
  }
  find(node: string): string {
    let n = node;
    for (let guard = 0; guard < 64; guard++) {
      const r = this.rep.get(n);
      if (r === undefined || r === n) return n;
      n = r;
    }
    return n;
  }
  nodes(el: NetlistElement | number): [string, string] {
    return typeof el === 'number' ? this.resolved[el] : [this.find(el.nodes[0]), this.find(el.nodes[1])];
  }
  other(i: number, node: string): string {
    const [a, b] = this.resolved[i];
    return a === node ? b : a;
  }
  at(node: string, kind: NetlistElement['kind'], used: Set<number>): number[] {
    const out: number[] = [];
    for (const i of this.adj.get(node) ?? []) if (this.elements[i].kind === kind && !used.has(i)) out.push(i);
    return out;
  }
  between(a: string, b: string, kind: NetlistElement['kind'], used: Set<number>): number[] {
    const out: number[] = [];
    for (const i of this.adj.get(a) ?? []) if (this.elements[i].kind === kind && !used.has(i) && this.other(i, a) === b) out.push(i);
    return out;
  }
}

interface StageMatch {
  pc?: number;
  sc?: number;
  da?: number;
  db?: number;
  xk: string;
  yk: string;
  quality: number;
}

function bestStage(g: Graph, xPrev: string, yPrev: string, used: Set<number>): StageMatch | null {
  let best: StageMatch | null = null;
  const consider = (m: StageMatch) => {
    if (!best || m.quality > best.quality) best = m;
  };
  const forbidden = (n: string) => n === GROUND || n === xPrev || n === yPrev;
  for (const pc of g.at(xPrev, 'C', used)) {
    const xk = g.other(pc, xPrev);
    if (forbidden(xk)) continue;
    const da = g.between(yPrev, xk, 'D', used)[0];
    let withSmooth = false;
    for (const sc of g.at(yPrev, 'C', used)) {
      if (sc === pc) continue;
      const yk = g.other(sc, yPrev);
      if (forbidden(yk) || yk === xk) continue;
      const db = g.between(xk, yk, 'D', used)[0];
      if (da === undefined && db === undefined) continue;
      withSmooth = true;
      consider({ pc, sc, da, db, xk, yk, quality: 2 + (da !== undefined ? 1 : 0) + (db !== undefined ? 1 : 0) });
    }
    if (!withSmooth && da !== undefined) {
      for (const db of g.at(xk, 'D', used)) {
        if (db === da) continue;
        const yk = g.other(db, xk);
        if (forbidden(yk)) continue;
        consider({ pc, da, db, xk, yk, quality: 3 });
        break;
      }
    }
  }
  if (!best && yPrev !== GROUND) {
    // Pumping capacitor missing (above stage 1: a ladder without its first pumping capacitor is not driven): y(k−1) –D→ x(k) –D→ y(k) with a smoothing capacitor y(k−1)→y(k).
    for (const sc of g.at(yPrev, 'C', used)) {
      const yk = g.other(sc, yPrev);
      if (forbidden(yk)) continue;
      for (const da of g.at(yPrev, 'D', used)) {
        const xk = g.other(da, yPrev);
        if (forbidden(xk) || xk === yk) continue;
        const db = g.between(xk, yk, 'D', used)[0];
        if (db !== undefined) {
          consider({ sc, da, db, xk, yk, quality: 3 });
          break;
        }
      }
    }
  }
  return best;
}

/** Orientation of a diode relative to a positive ladder: +1 as in a positive ladder, −1 reversed. */
function orientation(g: Graph, d: number, expectedAnode: string): 1 | -1 {
  return g.nodes(d)[0] === expectedAnode ? 1 : -1;
}

interface WalkedStage extends StageMatch {
  xPrev: string;
  yPrev: string;
  x2Prev?: string;
  pc2?: number;
  dc?: number;
  dd?: number;
  x2k?: string;
}

/**
 * Recognise the ladder topology of a netlist and diagnose faults on the parts that cause them.
 * Works on node connectivity only; element and node names are free.
 */
export function recognizeTopology(netlist: Netlist): TopologyReport {
  const els = netlist.elements;
  const diagnostics: Diagnostic[] = [];
  const counts = new Map<string, number>();
  const add = (d: Diagnostic) => {
    const c = counts.get(d.code) ?? 0;
    counts.set(d.code, c + 1);
    if (c < MAX_PER_CODE) diagnostics.push(d);
  };

  // Values and self-loops.
  els.forEach((el) => {
    const v = el.kind === 'R' ? el.resistanceOhm : el.kind === 'C' ? el.capacitanceF : null;
    if (v !== null && !(v > 0 && Number.isFinite(v))) {
      add({ code: 'non-positive-value', severity: 'error', element: el.name, message: `${el.name}: ${el.kind === 'R' ? 'resistance' : 'capacitance'} must be a positive finite number (got ${v})` });
    }
    if (el.nodes[0] === el.nodes[1]) {
      if (el.kind === 'V') add({ code: 'shorted-source', severity: 'error', element: el.name, node: el.nodes[0], message: `${el.name}: both source terminals are on node ${el.nodes[0]}, the source is shorted` });
      else if (el.kind === 'C') add({ code: 'shorted-capacitor', severity: 'warning', element: el.name, node: el.nodes[0], message: `${el.name}: both terminals are on node ${el.nodes[0]}, the capacitor is shorted` });
    }
  });
  // Voltage sources that close a loop among themselves (parallel sources included) short each other.
  const vParent = new Map<string, string>();
  const vFind = (n: string): string => {
    let r = n;
    while (vParent.has(r) && vParent.get(r) !== r) r = vParent.get(r) as string;
    return r;
  };
  els.forEach((el) => {
    if (el.kind !== 'V' || el.nodes[0] === el.nodes[1]) return;
    const a = vFind(el.nodes[0]);
    const b = vFind(el.nodes[1]);
    if (a === b) {
      add({ code: 'shorted-source', severity: 'error', element: el.name, node: el.nodes[0], message: `${el.name}: closes a loop of voltage sources (sources in parallel or in a ring short each other)` });
    } else vParent.set(a, b);
  });
  if (!els.some((el) => el.nodes.includes(GROUND))) {
    add({ code: 'no-ground', severity: 'error', message: 'no element connects to ground (node 0)' });
  }

  // Contract series resistors (source resistance, ESR): an R whose one end only touches one other C or V.
  const degree = new Map<string, number[]>();
  els.forEach((el, i) => {
    for (const n of new Set(el.nodes)) {
      let list = degree.get(n);
      if (!list) degree.set(n, (list = []));
      list.push(i);
    }
  });
  const contracted = new Set<number>();
  const contractedInto = new Map<number, number>();
  const rep = new Map<string, string>();
  els.forEach((el, i) => {
    if (el.kind !== 'R' || el.nodes[0] === el.nodes[1]) return;
    for (const side of [0, 1] as const) {
      const node = el.nodes[side];
      if (node === GROUND || rep.has(node)) continue;
      const list = degree.get(node) ?? [];
      if (list.length !== 2) continue;
      const partner = list[0] === i ? list[1] : list[0];
      const pk = els[partner].kind;
      if ((pk === 'C' || pk === 'V') && !contracted.has(partner)) {
        rep.set(node, el.nodes[1 - side]);
        contracted.add(i);
        contractedInto.set(i, partner);
        break;
      }
    }
  });
  const g = new Graph(els, contracted, rep);

  connectivityChecks(netlist, add);

  // Drive nodes: grounded sine sources.
  const drives: Drive[] = [];
  els.forEach((el, i) => {
    if (el.kind !== 'V' || !el.sine || el.sine.amplitude === 0) return;
    const [a, b] = g.nodes(el);
    let node: string | null = null;
    let sign = 1;
    if (b === GROUND && a !== GROUND) node = a;
    else if (a === GROUND && b !== GROUND) {
      node = b;
      sign = -1;
    }
    if (node === null) return;
    const flip = sign * el.sine.amplitude < 0 ? 180 : 0;
    const names = [el.name];
    contractedInto.forEach((partner, r) => {
      if (partner === i) names.push(els[r].name);
    });
    drives.push({
      node,
      amplitudeV: Math.abs(el.sine.amplitude),
      phaseDeg: (((el.sine.phaseDeg + flip) % 360) + 360) % 360,
      frequencyHz: el.sine.frequencyHz,
      elements: names,
    });
  });
  if (drives.length === 0 && els.length > 0) {
    add({ code: 'no-drive', severity: 'warning', message: 'no sine source between a node and ground drives the circuit' });
  }
  const freqs = new Set(drives.map((d) => d.frequencyHz));
  if (freqs.size > 1) add({ code: 'mixed-frequency', severity: 'warning', message: 'the sine sources run at different frequencies' });

  const used = new Set<number>();
  const walked: Array<{ drive: Drive; stages: WalkedStage[]; drive2?: Drive }> = [];

  const walkOne = (drive: Drive): boolean => {
    const stages: WalkedStage[] = [];
    let xPrev = drive.node;
    let yPrev = GROUND;
    while (stages.length < els.length) {
      const m = bestStage(g, xPrev, yPrev, used);
      if (!m || m.quality < 3) break;
      for (const i of [m.pc, m.sc, m.da, m.db]) if (i !== undefined) used.add(i);
      stages.push({ ...m, xPrev, yPrev });
      xPrev = m.xk;
      yPrev = m.yk;
    }
    if (stages.length === 0) return false;
    walked.push({ drive, stages });
    return true;
  };
  // Pass 1: one ladder per drive, or the drive joins an existing ladder as its antiphase column.
  const attachedDrives = new Set<Drive>();
  for (const drive of drives) {
    if (attachSecondColumn(g, drive, walked, used)) attachedDrives.add(drive);
    else walkOne(drive);
  }
  // Pass 2: further ladders from the same drive (a bipolar pair shares one source).
  for (const drive of drives) {
    if (attachedDrives.has(drive)) continue;
    for (let guard = 0; guard < 16 && walkOne(drive); guard++);
  }

  const columnOf: Record<string, ColumnRole> = {};
  const stageOf: Record<string, number> = {};
  for (const node of new Set(els.flatMap((e) => e.nodes))) columnOf[node] = node === GROUND ? 'ground' : 'other';
  for (const d of drives) columnOf[d.node] = 'source';
  els.forEach((el) => {
    if (el.kind === 'V') for (const n of el.nodes) if (n !== GROUND) columnOf[n] = 'source';
  });

  const ladders: LadderReport[] = walked.map((w) => buildLadder(g, w, columnOf, stageOf, add));

  // Leftover capacitors and diodes: strays (ladder node to ground) are fine, anything else is custom.
  const ladderNodes = new Set<string>(ladders.flatMap((l) => [...l.drivenColumn, ...l.smoothingColumn, ...(l.secondDrivenColumn ?? [])]));
  const strayCapacitors: string[] = [];
  let leftovers = 0;
  els.forEach((el, i) => {
    if (used.has(i) || contracted.has(i)) return;
    if (el.kind === 'C') {
      const [a, b] = g.nodes(el);
      if ((a === GROUND && ladderNodes.has(b)) || (b === GROUND && ladderNodes.has(a))) strayCapacitors.push(el.name);
      else leftovers++;
    } else if (el.kind === 'D') leftovers++;
  });

  // Loads on the outputs.
  const outputs = ladders.map((l) => ({ node: l.outputNode, polarity: l.polarity }));
  assignLoads(g, ladders, els);

  let kind: TopologyKind = 'custom';
  if (leftovers === 0) {
    if (ladders.length === 1) kind = ladders[0].variant;
    else if (ladders.length === 2 && ladders.every((l) => l.variant === 'half-wave') && ladders[0].polarity !== ladders[1].polarity) kind = 'symmetric';
  }
  if (kind === 'custom' && els.length > 0) {
    add({
      code: 'custom-topology',
      severity: 'info',
      message:
        ladders.length === 0
          ? 'no multiplier ladder recognised; the circuit is solved as drawn'
          : `not a plain half-wave, full-wave or symmetric ladder (${ladders.length} ladder${ladders.length === 1 ? '' : 's'}${leftovers ? `, ${leftovers} other capacitor or diode part${leftovers === 1 ? '' : 's'}` : ''}); solved as drawn`,
    });
  }

  // Overload: the load asks more than the ladder can feed.
  if (kind !== 'custom') {
    for (const l of ladders) {
      if (l.loadCurrentA <= 0) continue;
      const caps = capsOf(netlist, l);
      if (!caps || ![...caps.pumpC, ...caps.smoothC].every((c) => c > 0 && Number.isFinite(c)) || !(l.frequencyHz > 0)) continue;
      const est = estimateLadder({
        topology: l.variant,
        stages: l.stages,
        drivePeakV: l.drivePeakV,
        frequencyHz: l.frequencyHz,
        pumpC: caps.pumpC,
        smoothC: caps.smoothC,
        loadCurrentA: l.loadCurrentA,
      });
      if (est.outputMeanV <= 0 || est.optimumStages < l.stages) {
        add({
          code: 'overload',
          severity: 'warning',
          node: l.outputNode,
          element: l.loadElements[0],
          message:
            est.outputMeanV <= 0
              ? `load of ${l.loadCurrentA} A is more than the ladder can feed: the estimated loaded output is ${Math.round(est.outputMeanV)} V`
              : `load of ${l.loadCurrentA} A is above the optimum-stage current for ${l.stages} stages: the optimum is ${est.optimumStages.toFixed(1)} stages, fewer stages would give more output`,
        });
      }
    }
  }

  const first = ladders[0];
  return {
    kind,
    ladders,
    outputs,
    columnOf,
    stageOf,
    ...(first ? { drivePeakV: first.drivePeakV, frequencyHz: first.frequencyHz } : drives[0] ? { drivePeakV: drives[0].amplitudeV, frequencyHz: drives[0].frequencyHz } : {}),
    strayCapacitors,
    diagnostics: attachOrigins(diagnostics, netlist),
  };
}

/** Try to attach `drive` as the antiphase second driven column of an already walked ladder (full-wave, REFERENCES §2). */
function attachSecondColumn(
  g: Graph,
  drive: Drive,
  walked: Array<{ drive: Drive; stages: WalkedStage[]; drive2?: Drive }>,
  used: Set<number>,
): boolean {
  for (const w of walked) {
    if (w.drive2 || Math.abs(Math.abs(w.drive.phaseDeg - drive.phaseDeg) - 180) > 1) continue;
    const tentative = new Set(used);
    let x2Prev = drive.node;
    const parts: Array<{ pc2?: number; dc?: number; dd?: number; x2k: string; x2Prev: string }> = [];
    for (const st of w.stages) {
      let match: { pc2?: number; dc?: number; dd?: number; x2k?: string; q: number } = { q: 0 };
      for (const pc2 of g.at(x2Prev, 'C', tentative)) {
        const x2k = g.other(pc2, x2Prev);
        if (x2k === GROUND || x2k === st.yPrev || x2k === st.yk) continue;
        const dc = g.between(st.yPrev, x2k, 'D', tentative)[0];
        const dd = g.between(x2k, st.yk, 'D', tentative)[0];
        const q = 1 + (dc !== undefined ? 1 : 0) + (dd !== undefined ? 1 : 0);
        if (q > match.q) match = { pc2, dc, dd, x2k, q };
      }
      if (match.q < 2 || match.x2k === undefined) break;
      for (const i of [match.pc2, match.dc, match.dd]) if (i !== undefined) tentative.add(i);
      parts.push({ pc2: match.pc2, dc: match.dc, dd: match.dd, x2k: match.x2k, x2Prev });
      x2Prev = match.x2k;
    }
    if (parts.length > 0 && parts.length >= Math.ceil(w.stages.length / 2)) {
      parts.forEach((p, k) => Object.assign(w.stages[k], p));
      tentative.forEach((i) => used.add(i));
      w.drive2 = drive;
      return true;
    }
  }
  return false;
}

function buildLadder(
  g: Graph,
  w: { drive: Drive; stages: WalkedStage[]; drive2?: Drive },
  columnOf: Record<string, ColumnRole>,
  stageOf: Record<string, number>,
  add: (d: Diagnostic) => void,
): LadderReport {
  const els = g.elements;
  // Vote on polarity: in a positive ladder A has its anode on y(k−1), B on x(k); C, D likewise on x2.
  const votes: Array<{ d: number; o: 1 | -1; stage: number; role: string }> = [];
  w.stages.forEach((s, k) => {
    if (s.da !== undefined) votes.push({ d: s.da, o: orientation(g, s.da, s.yPrev), stage: k + 1, role: 'A' });
    if (s.db !== undefined) votes.push({ d: s.db, o: orientation(g, s.db, s.xk), stage: k + 1, role: 'B' });
    if (s.dc !== undefined) votes.push({ d: s.dc, o: orientation(g, s.dc, s.yPrev), stage: k + 1, role: 'C' });
    if (s.dd !== undefined && s.x2k !== undefined) votes.push({ d: s.dd, o: orientation(g, s.dd, s.x2k), stage: k + 1, role: 'D' });
  });
  const sum = votes.reduce((acc, v) => acc + v.o, 0);
  const topVote = votes.filter((v) => v.role === 'B').pop();
  const sign = sum > 0 ? 1 : sum < 0 ? -1 : (topVote?.o ?? 1);
  const polarity: Polarity = sign > 0 ? 'positive' : 'negative';
  for (const v of votes) {
    if (v.o !== sign) {
      add({
        code: 'reversed-diode',
        severity: 'warning',
        element: els[v.d].name,
        stage: v.stage,
        message: `${els[v.d].name}: diode reversed in stage ${v.stage} of the ${polarity} ladder`,
      });
    }
  }
  const full = w.drive2 !== undefined;
  w.stages.forEach((s, k) => {
    const stage = k + 1;
    if (s.pc === undefined) add({ code: 'missing-capacitor', severity: 'warning', node: s.xk, stage, message: `stage ${stage}: pumping capacitor missing between ${s.xPrev} and ${s.xk}` });
    if (s.sc === undefined) add({ code: 'missing-capacitor', severity: 'warning', node: s.yk, stage, message: `stage ${stage}: smoothing capacitor missing between ${s.yPrev} and ${s.yk}` });
    if (s.da === undefined) add({ code: 'missing-diode', severity: 'warning', node: s.xk, stage, message: `stage ${stage}: diode missing between ${s.yPrev} and ${s.xk}` });
    if (s.db === undefined) add({ code: 'missing-diode', severity: 'warning', node: s.yk, stage, message: `stage ${stage}: diode missing between ${s.xk} and ${s.yk}` });
    if (full && s.x2k !== undefined) {
      if (s.dc === undefined) add({ code: 'missing-diode', severity: 'warning', node: s.x2k, stage, message: `stage ${stage}: diode missing between ${s.yPrev} and ${s.x2k}` });
      if (s.dd === undefined) add({ code: 'missing-diode', severity: 'warning', node: s.x2k, stage, message: `stage ${stage}: diode missing between ${s.x2k} and ${s.yk}` });
    } else if (full) {
      add({ code: 'missing-capacitor', severity: 'warning', stage, message: `stage ${stage}: second driven column ends below this stage` });
    }
    columnOf[s.xk] = 'driven';
    columnOf[s.yk] = 'smoothing';
    stageOf[s.xk] = stage;
    stageOf[s.yk] = stage;
    if (s.x2k !== undefined) {
      columnOf[s.x2k] = 'driven2';
      stageOf[s.x2k] = stage;
    }
  });
  const name = (i: number | undefined) => (i === undefined ? undefined : els[i].name);
  const n = w.stages.length;
  return {
    variant: full ? 'full-wave' : 'half-wave',
    polarity,
    stages: n,
    outputNode: w.stages[n - 1].yk,
    driveNode: w.drive.node,
    drivenColumn: w.stages.map((s) => s.xk),
    smoothingColumn: w.stages.map((s) => s.yk),
    ...(full
      ? { secondDrivenColumn: w.stages.filter((s) => s.x2k !== undefined).map((s) => s.x2k as string), secondDriveNode: w.drive2?.node }
      : {}),
    sourceElements: [...w.drive.elements, ...(w.drive2?.elements ?? [])],
    stageElements: w.stages.map((s, k) => {
      const entry: StageElements = { stage: k + 1, diodes: [s.da, s.db, s.dc, s.dd].filter((d): d is number => d !== undefined).map((d) => els[d].name) };
      if (s.pc !== undefined) entry.pumpC = name(s.pc);
      if (s.sc !== undefined) entry.smoothC = name(s.sc);
      if (s.pc2 !== undefined) entry.pump2C = name(s.pc2);
      return entry;
    }),
    drivePeakV: w.drive.amplitudeV,
    frequencyHz: w.drive.frequencyHz,
    loadCurrentA: 0,
    loadElements: [],
  };
}

/** Current drawn from each ladder output by I and R elements (R loads at the no-load voltage 2nVp). */
function assignLoads(g: Graph, ladders: LadderReport[], els: NetlistElement[]): void {
  const byOutput = new Map(ladders.map((l) => [l.outputNode, l] as const));
  const noLoad = (l: LadderReport) => (l.polarity === 'positive' ? 1 : -1) * 2 * l.stages * l.drivePeakV;
  for (const el of els) {
    if (el.kind !== 'I' && el.kind !== 'R') continue;
    const [a, b] = g.nodes(el);
    const la = byOutput.get(a);
    const lb = byOutput.get(b);
    if (!la && !lb) continue;
    if (el.kind === 'I') {
      // Positive dcA flows from a through the source to b: it draws from a, feeds b.
      if (la) {
        la.loadCurrentA += (la.polarity === 'positive' ? 1 : -1) * el.dcA;
        la.loadElements.push(el.name);
      }
      if (lb) {
        lb.loadCurrentA += (lb.polarity === 'positive' ? -1 : 1) * el.dcA;
        lb.loadElements.push(el.name);
      }
    } else if (el.resistanceOhm > 0) {
      const va = la ? noLoad(la) : 0;
      const vb = lb ? noLoad(lb) : 0;
      const current = Math.abs(va - vb) / el.resistanceOhm;
      for (const l of [la, lb]) {
        if (!l) continue;
        l.loadCurrentA += current;
        l.loadElements.push(el.name);
      }
    }
  }
}

/** Pumping and smoothing capacitances per stage (F, bottom first), or null when a part is missing. */
export function capsOf(netlist: Netlist, ladder: LadderReport): { pumpC: number[]; smoothC: number[]; pump2C?: number[] } | null {
  const byName = new Map(netlist.elements.filter((e): e is CapacitorElement => e.kind === 'C').map((e) => [e.name, e.capacitanceF] as const));
  const pumpC: number[] = [];
  const smoothC: number[] = [];
  const pump2C: number[] = [];
  for (const s of ladder.stageElements) {
    const p = s.pumpC ? byName.get(s.pumpC) : undefined;
    const c = s.smoothC ? byName.get(s.smoothC) : undefined;
    if (p === undefined || c === undefined) return null;
    pumpC.push(p);
    smoothC.push(c);
    if (ladder.variant === 'full-wave') {
      const p2 = s.pump2C ? byName.get(s.pump2C) : undefined;
      if (p2 === undefined) return null;
      pump2C.push(p2);
    }
  }
  return { pumpC, smoothC, ...(ladder.variant === 'full-wave' ? { pump2C } : {}) };
}

/** Floating sub-circuits, dangling nodes and nodes without a DC path to ground. */
function connectivityChecks(netlist: Netlist, add: (d: Diagnostic) => void): void {
  const els = netlist.elements;
  const nodes = [...new Set(els.flatMap((e) => e.nodes))];
  const index = new Map(nodes.map((n, i) => [n, i] as const));
  const makeUf = () => {
    const parent = nodes.map((_, i) => i);
    const find = (i: number): number => {
      let r = i;
      while (parent[r] !== r) r = parent[r];
      let c = i;
      while (parent[c] !== r) {
        const next = parent[c];
        parent[c] = r;
        c = next;
      }
      return r;
    };
    return { find, union: (a: number, b: number) => (parent[find(a)] = find(b)) };
  };
  const all = makeUf();
  const dc = makeUf();
  const deg = new Map<string, number>();
  for (const el of els) {
    const a = index.get(el.nodes[0]) as number;
    const b = index.get(el.nodes[1]) as number;
    all.union(a, b);
    if (el.kind === 'R' || el.kind === 'D' || el.kind === 'V') dc.union(a, b);
    for (const n of new Set(el.nodes)) deg.set(n, (deg.get(n) ?? 0) + 1);
  }
  const g = index.get(GROUND);
  if (g === undefined) return;
  const reported = new Set<number>();
  for (const n of nodes) {
    const i = index.get(n) as number;
    if (all.find(i) !== all.find(g)) {
      const root = all.find(i);
      if (!reported.has(root)) {
        reported.add(root);
        add({ code: 'floating-node', severity: 'error', node: n, message: `node ${n} is not connected to ground through any part` });
      }
      continue;
    }
    if (n !== GROUND && (deg.get(n) ?? 0) < 2) {
      add({ code: 'floating-node', severity: 'warning', node: n, message: `node ${n} connects to only one part (an open end)` });
    } else if (dc.find(i) !== dc.find(g)) {
      add({ code: 'no-dc-path', severity: 'warning', node: n, message: `node ${n} has no DC path to ground (only capacitors and current sources reach it)` });
    }
  }
}
