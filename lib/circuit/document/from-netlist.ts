/**
 * Netlist → canvas document: the import that lays a SPICE-subset netlist out as blocks. The
 * ladders that topology recognition finds (`recognizeTopology`, Cockcroft–Walton column
 * convention, REFERENCES §1–§3) become stage blocks placed like the starters; their drives become
 * AC source blocks (centre-tapped when a full-wave ladder's two antiphase drives match), with a
 * series resistor read as the source resistance and a capacitor's series resistor as its ESR; the
 * R and I elements at the outputs become load blocks; a uniform stray capacitance at every ladder
 * node becomes the design's stray-capacitance setting; every other element becomes a single part
 * (or a source block) in rows below. The result compiles (`compileDocument`) to a netlist with the
 * same circuit, so it solves to the same node voltages; where the canvas cannot hold a detail
 * (a sine's delay, a diode parameter the canvas does not keep, the sine part of a current source)
 * the detail is dropped and a warning says so.
 */
import { GROUND, type DiodeElement, type Netlist, type NetlistElement, type VoltageSourceElement } from '../netlist/types';
import { defaultDiodeModel } from '../netlist/parse';
import { recognizeTopology, type LadderReport, type TopologyReport } from '../compile/topology';
import { STAGE_WIDTH, blockSize } from './geometry';
import {
  DOCUMENT_SCHEMA_VERSION,
  MAX_BLOCKS,
  MAX_EDGES,
  designDocumentSchema,
  type CapacitorSpec,
  type DesignBlock,
  type DesignDocument,
  type DiodeModelParams,
  type DiodeSpec,
  type Wire,
} from './schema';

/** Outcome of {@link documentFromNetlist}; `nodes` maps every netlist node that is drawn to one port on it. */
export type NetlistImport =
  | { ok: true; document: DesignDocument; warnings: string[]; nodes: Record<string, { blockId: string; port: string }> }
  | { ok: false; reason: string };

/** Layout (canvas px), as in the starters: drive at x 0, stage 1 at x 200, ladder rows 460 apart. */
const LAYOUT = {
  firstStageX: 200,
  rowY: 120,
  rowPitch: 460,
  symmetricY: { positive: -40, negative: 380 },
  symmetricLoadY: 170,
  loadDy: 100,
  loadPitch: 100,
  groundDy: 200,
  partsGap: 80,
  partPitchX: 140,
  partPitchY: 120,
  partsPerRow: 8,
} as const;

type StageData = Extract<DesignBlock, { kind: 'stage' }>['data'];

/** One drive of a recognised ladder, read off its V element and the series resistors around it. */
interface Drive {
  v: VoltageSourceElement;
  /** Node the ladder is driven at (behind any series resistance). */
  hot: string;
  amplitudeV: number;
  phaseDeg: number;
  frequencyHz: number;
  sourceResistanceOhm: number;
  /** The V element and its series resistors. */
  consumed: string[];
}

const relEq = (a: number, b: number) => Math.abs(a - b) <= 1e-12 * Math.max(Math.abs(a), Math.abs(b));
const norm360 = (deg: number) => ((deg % 360) + 360) % 360;

/** Builds the document while keeping track of which netlist nodes sit on which block ports. */
class Layout {
  blocks: DesignBlock[] = [];
  private readonly portsOnNode = new Map<string, Array<{ blockId: string; port: string }>>();
  private readonly used = new Set<string>();

  /** A fresh id: `<prefix>` itself first when `bare`, else `<prefix>1`, then `<prefix>2`, ... */
  id(prefix: string, bare = false): string {
    if (bare && !this.used.has(prefix)) {
      this.used.add(prefix);
      return prefix;
    }
    let k = bare ? 2 : 1;
    while (this.used.has(`${prefix}${k}`)) k++;
    this.used.add(`${prefix}${k}`);
    return `${prefix}${k}`;
  }
  add(block: DesignBlock, ports: Record<string, string>): DesignBlock {
    this.blocks.push(block);
    for (const [port, node] of Object.entries(ports)) {
      let list = this.portsOnNode.get(node);
      if (!list) this.portsOnNode.set(node, (list = []));
      list.push({ blockId: block.id, port });
    }
    return block;
  }
  hasNode(node: string): boolean {
    return this.portsOnNode.has(node);
  }
  /** Ground block (when anything sits on node 0) and one wire from each node's first port to each of its other ports. */
  finish(groundAt: { x: number; y: number }): { wires: Wire[]; nodes: Record<string, { blockId: string; port: string }> } {
    const onGround = this.portsOnNode.get(GROUND);
    if (onGround) {
      const id = this.id('gnd', true);
      this.blocks.push({ id, kind: 'ground', position: groundAt, label: 'Ground', data: {} });
      onGround.unshift({ blockId: id, port: 'g' });
    }
    const wires: Wire[] = [];
    const nodes: Record<string, { blockId: string; port: string }> = {};
    for (const [node, ports] of this.portsOnNode) {
      // Nodes the layout made up (between a drive and its DC offset) are not netlist nodes.
      if (!node.includes('\u0000')) nodes[node] = ports[0];
      for (const p of ports.slice(1)) {
        wires.push({ id: `w${wires.length + 1}`, source: ports[0].blockId, sourcePort: ports[0].port, target: p.blockId, targetPort: p.port });
      }
    }
    return { wires, nodes };
  }
}

/** The canvas's diode parameters for a diode element (SPICE 3 area scaling folded in), and what could not be kept. */
function diodeParams(netlist: Netlist, d: DiodeElement): { params: DiodeModelParams; dropped: string[] } | null {
  const m = netlist.models[d.model.toUpperCase()];
  if (!m) return null;
  const area = d.area ?? 1;
  const def = defaultDiodeModel(m.name);
  const params: DiodeModelParams = { isA: m.isA * area, n: m.n, rsOhm: m.rsOhm / area };
  if (m.bvV !== undefined) params.bvV = m.bvV;
  if (m.cjoF > 0) params.cjoF = m.cjoF * area;
  if (m.ttS > 0) params.ttS = m.ttS;
  const dropped: string[] = [];
  if (!relEq(m.ibvA, def.ibvA) && m.bvV !== undefined) dropped.push('IBV');
  if (m.cjoF > 0) {
    if (!relEq(m.vjV, def.vjV)) dropped.push('VJ');
    if (!relEq(m.m, def.m)) dropped.push('M');
    if (!relEq(m.fc, def.fc)) dropped.push('FC');
  }
  return { params, dropped };
}

/** One warning per diode model (repeated diodes give the same text, and warnings are de-duplicated). */
function droppedWarning(model: string, dropped: string[]): string {
  const many = dropped.length > 1;
  return `Diode model ${model}: parameter${many ? 's' : ''} ${dropped.join(', ')} ${many ? 'are' : 'is'} not kept on the canvas; the SPICE default${many ? 's are' : ' is'} used.`;
}

/**
 * Lay a netlist out as a canvas document. Fails (with a reason) when the netlist cannot be
 * solved as written (no ground, a shorted source, a non-positive value, a part cut off from
 * ground), names an undefined diode model, or needs more blocks or wires than a document holds.
 */
export function documentFromNetlist(netlist: Netlist): NetlistImport {
  const els = netlist.elements;
  if (els.length === 0) return { ok: false, reason: 'The netlist has no parts to lay out.' };
  for (const el of els) {
    if (el.kind === 'D' && !netlist.models[el.model.toUpperCase()]) return { ok: false, reason: `${el.name} uses diode model "${el.model}", which the netlist does not define.` };
    const values = el.kind === 'R' ? [el.resistanceOhm] : el.kind === 'C' ? [el.capacitanceF] : el.kind === 'V' ? [el.dcV, ...(el.sine ? [el.sine.amplitude, el.sine.frequencyHz, el.sine.offsetV, el.sine.phaseDeg] : [])] : el.kind === 'I' ? [el.dcA] : [];
    if (!values.every(Number.isFinite)) return { ok: false, reason: `${el.name} has a value that is not a finite number.` };
  }
  const topo = recognizeTopology(netlist);
  const fatal = topo.diagnostics.find((d) => d.severity === 'error');
  if (fatal) return { ok: false, reason: `The netlist cannot be solved as written: ${fatal.message}.` };

  const byName = new Map(els.map((e) => [e.name, e] as const));
  const degree = new Map<string, NetlistElement[]>();
  for (const el of els) {
    for (const n of new Set(el.nodes)) {
      let list = degree.get(n);
      if (!list) degree.set(n, (list = []));
      list.push(el);
    }
  }
  const warnings: string[] = [];
  const consumed = new Set<string>();
  const lay = new Layout();

  // Ladders that can be drawn as stage blocks, with their drives.
  const plans = topo.ladders.map((l) => planLadder(netlist, l, byName, degree, warnings));
  const drawn = plans.filter((p): p is LadderPlan => p !== null);
  const symmetric = topo.kind === 'symmetric' && drawn.length === 2;
  const stray = uniformStray(topo, drawn.length === topo.ladders.length, byName);

  // Drives: one source block per V element (a symmetric pair shares one), centre-tapped where it fits.
  const placedDrives = new Set<string>();
  let row = 0;
  const rowY = (r: number) => LAYOUT.rowY + r * LAYOUT.rowPitch;
  const ladderYs: number[] = [];
  drawn.forEach((plan) => {
    const y = symmetric ? LAYOUT.symmetricY[plan.ladder.polarity] : rowY(row++);
    ladderYs.push(y);
    const placeSourceAt = symmetric ? LAYOUT.rowY : y;
    const [d1, d2] = plan.drives;
    if (placedDrives.has(d1.v.name) && (!d2 || placedDrives.has(d2.v.name))) return;
    const ct =
      d2 &&
      relEq(d1.amplitudeV, d2.amplitudeV) &&
      relEq(d1.frequencyHz, d2.frequencyHz) &&
      relEq(d1.sourceResistanceOhm, d2.sourceResistanceOhm) &&
      Math.abs(norm360(d2.phaseDeg - d1.phaseDeg) - 180) < 1e-9;
    if (ct) {
      const id = lay.id('src', true);
      lay.add(
        { id, kind: 'acSource', position: { x: 0, y: placeSourceAt }, label: 'Two-phase drive', data: { variant: 'centreTapped', amplitudeV: d1.amplitudeV, amplitudeMode: 'peak', frequencyHz: d1.frequencyHz, phaseDeg: d1.phaseDeg, sourceResistanceOhm: d1.sourceResistanceOhm } },
        { hot: d1.hot, hotB: d2.hot, ct: GROUND },
      );
      placedDrives.add(d1.v.name).add(d2.v.name);
    } else {
      plan.drives.forEach((d, i) => {
        if (placedDrives.has(d.v.name)) return;
        const id = lay.id('src', true);
        lay.add(
          { id, kind: 'acSource', position: { x: 0, y: placeSourceAt - i * 140 }, label: i === 0 ? 'Drive' : 'Antiphase drive', data: { variant: 'single', amplitudeV: d.amplitudeV, amplitudeMode: 'peak', frequencyHz: d.frequencyHz, phaseDeg: d.phaseDeg, sourceResistanceOhm: d.sourceResistanceOhm } },
          { hot: d.hot, ret: GROUND },
        );
        placedDrives.add(d.v.name);
      });
    }
    for (const d of plan.drives) d.consumed.forEach((n) => consumed.add(n));
  });

  // Stage blocks.
  drawn.forEach((plan, li) => {
    const l = plan.ladder;
    const y = ladderYs[li];
    const prefix = symmetric ? (l.polarity === 'positive' ? 'p' : 'm') : li === 0 ? 's' : `l${li + 1}s`;
    const labelOf = (k: number) => (symmetric ? `${l.polarity === 'positive' ? '+' : '−'} stage ${k}` : li === 0 ? `Stage ${k}` : `Ladder ${li + 1} stage ${k}`);
    plan.stages.forEach((data, i) => {
      const k = i + 1;
      const x = (j: number) => (j === 0 ? l.driveNode : l.drivenColumn[j - 1]);
      const yNode = (j: number) => (j === 0 ? GROUND : l.smoothingColumn[j - 1]);
      const ports: Record<string, string> = { xIn: x(i), yIn: yNode(i), xOut: x(k), yOut: yNode(k) };
      if (data.variant === 'full') {
        const col = l.secondDrivenColumn as string[];
        ports.x2In = i === 0 ? (l.secondDriveNode as string) : col[i - 1];
        ports.x2Out = col[i];
      }
      lay.add({ id: lay.id(prefix), kind: 'stage', position: { x: LAYOUT.firstStageX + i * STAGE_WIDTH, y }, label: labelOf(k), data }, ports);
    });
    plan.consumed.forEach((n) => consumed.add(n));
  });
  if (stray) stray.elements.forEach((n) => consumed.add(n));

  // Loads at the outputs of drawn ladders, beside the top stage.
  const expected = new Map(topo.ladders.map((l) => [l.outputNode, (l.polarity === 'positive' ? 1 : -1) * 2 * l.stages * l.drivePeakV] as const));
  // A symmetric pair's loads share one spot between the ladders, so they queue along one row.
  let shared = 0;
  drawn.forEach((plan, li) => {
    const l = plan.ladder;
    let own = 0;
    for (const name of l.loadElements) {
      if (consumed.has(name)) continue;
      const el = byName.get(name) as NetlistElement;
      const j = symmetric ? shared : own;
      const at = { x: LAYOUT.firstStageX + l.stages * STAGE_WIDTH + j * LAYOUT.loadPitch, y: symmetric ? LAYOUT.symmetricLoadY : ladderYs[li] + LAYOUT.loadDy };
      if (!placeLoad(lay, el, at, expected, warnings)) continue;
      consumed.add(name);
      if (symmetric) shared++;
      else own++;
    }
  });

  // Everything else: single parts and sources in rows below the drawing.
  const bottom = lay.blocks.reduce((acc, b) => Math.max(acc, b.position.y + blockSize(b).height), drawn.length > 0 ? LAYOUT.rowY + LAYOUT.groundDy : 0);
  const partsY = drawn.length > 0 ? bottom + LAYOUT.partsGap : LAYOUT.rowY;
  let slot = 0;
  const nextSlot = () => {
    const s = slot++;
    return { x: (s % LAYOUT.partsPerRow) * LAYOUT.partPitchX, y: partsY + Math.floor(s / LAYOUT.partsPerRow) * LAYOUT.partPitchY };
  };
  for (const el of els) {
    if (consumed.has(el.name)) continue;
    consumed.add(el.name);
    const [a, b] = el.nodes;
    switch (el.kind) {
      case 'R':
        lay.add({ id: lay.id('r'), kind: 'resistor', position: nextSlot(), label: el.name.slice(0, 80), data: { resistanceOhm: el.resistanceOhm } }, { a, b });
        break;
      case 'C':
        if (el.initialV !== undefined) warnings.push(`${el.name}: the initial condition IC=${el.initialV} V is not kept (the steady state does not depend on it).`);
        lay.add({ id: lay.id('c'), kind: 'capacitor', position: nextSlot(), label: el.name.slice(0, 80), data: { capacitanceF: el.capacitanceF } }, { a, b });
        break;
      case 'D': {
        const p = diodeParams(netlist, el) as { params: DiodeModelParams; dropped: string[] };
        if (p.dropped.length > 0) warnings.push(droppedWarning(el.model, p.dropped));
        lay.add({ id: lay.id('d'), kind: 'diode', position: nextSlot(), label: el.name.slice(0, 80), data: { model: p.params } }, { anode: a, cathode: b });
        break;
      }
      case 'V': {
        const s = el.sine;
        if (s && s.amplitude !== 0) {
          if (s.delayS !== 0) warnings.push(`${el.name}: the sine delay TD is not kept (it only shifts the steady state in time).`);
          if (s.damping !== 0) warnings.push(`${el.name}: the sine damping THETA is not kept.`);
          // A DC offset stays exact as a DC source in series with the sine drive.
          const offset = el.dcV + s.offsetV;
          const ret = offset !== 0 ? `${el.name}\u0000offset` : b;
          lay.add(
            { id: lay.id('src', true), kind: 'acSource', position: nextSlot(), label: el.name.slice(0, 80), data: { variant: 'single', amplitudeV: Math.abs(s.amplitude), amplitudeMode: 'peak', frequencyHz: s.frequencyHz, phaseDeg: norm360(s.phaseDeg + (s.amplitude < 0 ? 180 : 0)), sourceResistanceOhm: 0 } },
            { hot: a, ret },
          );
          if (offset !== 0) lay.add({ id: lay.id('vdc'), kind: 'dcSource', position: nextSlot(), label: `${el.name} offset`.slice(0, 80), data: { voltageV: offset, sourceResistanceOhm: 0 } }, { pos: ret, neg: b });
        } else {
          lay.add({ id: lay.id('vdc'), kind: 'dcSource', position: nextSlot(), label: el.name.slice(0, 80), data: { voltageV: el.dcV + (s?.offsetV ?? 0), sourceResistanceOhm: 0 } }, { pos: a, neg: b });
        }
        break;
      }
      case 'I':
        if (!placeLoad(lay, el, nextSlot(), expected, warnings)) slot--;
        break;
    }
  }

  const { wires, nodes } = lay.finish(drawn.length > 0 ? { x: 0, y: LAYOUT.rowY + LAYOUT.groundDy } : nextSlot());
  if (lay.blocks.length > MAX_BLOCKS) return { ok: false, reason: `The netlist needs ${lay.blocks.length} blocks; a design holds at most ${MAX_BLOCKS}.` };
  if (wires.length > MAX_EDGES) return { ok: false, reason: `The netlist needs ${wires.length} wires; a design holds at most ${MAX_EDGES}.` };
  const doc: DesignDocument = {
    schemaVersion: DOCUMENT_SCHEMA_VERSION,
    blocks: lay.blocks,
    wires,
    settings: { strayCapacitanceF: stray?.capacitanceF ?? 0, deratingFraction: 0.8 },
  };
  const checked = designDocumentSchema.safeParse(doc);
  if (!checked.success) {
    const issue = checked.error.issues[0];
    return { ok: false, reason: `The laid-out design is not valid: ${issue.path.join('.')}: ${issue.message}.` };
  }
  return { ok: true, document: doc, warnings: [...new Set(warnings)], nodes };
}

/** A recognised ladder that can be drawn as stage blocks: its stages' values, drives and consumed elements. */
interface LadderPlan {
  ladder: LadderReport;
  stages: StageData[];
  drives: Drive[];
  consumed: string[];
}

/**
 * Check a recognised ladder part by part against the stage block's wiring and read its values.
 * Null (with a warning) when a stage is incomplete, a diode is turned against the ladder's
 * polarity, or a drive cannot be read; the ladder's elements are then laid out as single parts.
 */
function planLadder(
  netlist: Netlist,
  l: LadderReport,
  byName: Map<string, NetlistElement>,
  degree: Map<string, NetlistElement[]>,
  warnings: string[],
): LadderPlan | null {
  const full = l.variant === 'full-wave';
  const giveUp = (why: string): null => {
    warnings.push(`The ${l.polarity} ${l.variant} ladder of ${l.stages} stage${l.stages === 1 ? '' : 's'} at ${l.outputNode} is laid out as single parts: ${why}.`);
    return null;
  };
  if (full && (l.secondDrivenColumn?.length !== l.stages || l.secondDriveNode === undefined)) return giveUp('its second driven column does not run the full height');
  const consumed: string[] = [];
  const sign = l.polarity === 'positive' ? 1 : -1;

  /** A capacitor between nodes p and q, directly or through a series resistor (ESR) on a node of its own. */
  const capacitor = (name: string | undefined, p: string, q: string): CapacitorSpec | null => {
    const el = name ? byName.get(name) : undefined;
    if (!el || el.kind !== 'C') return null;
    const [a, b] = el.nodes;
    if ((a === p && b === q) || (a === q && b === p)) {
      consumed.push(el.name);
      return { capacitanceF: el.capacitanceF };
    }
    const near = a === p || a === q ? a : b === p || b === q ? b : null;
    if (near === null) return null;
    const mid = near === a ? b : a;
    const far = near === p ? q : p;
    const around = degree.get(mid) ?? [];
    const esr = around.find((e): e is Extract<NetlistElement, { kind: 'R' }> => e.kind === 'R' && e.nodes.includes(far));
    if (mid === GROUND || around.length !== 2 || !esr) return null;
    consumed.push(el.name, esr.name);
    return { capacitanceF: el.capacitanceF, esrOhm: esr.resistanceOhm };
  };
  /** A diode of this ladder, checked to sit between `anode` and `cathode` of a positive ladder (reversed when negative). */
  const diode = (name: string | undefined, anode: string, cathode: string): DiodeSpec | null => {
    const el = name ? byName.get(name) : undefined;
    if (!el || el.kind !== 'D') return null;
    const [an, ca] = sign > 0 ? [anode, cathode] : [cathode, anode];
    if (el.nodes[0] !== an || el.nodes[1] !== ca) return null;
    const p = diodeParams(netlist, el);
    if (!p) return null;
    if (p.dropped.length > 0) warnings.push(droppedWarning(el.model, p.dropped));
    consumed.push(el.name);
    return { model: p.params };
  };

  const stages: StageData[] = [];
  for (let i = 0; i < l.stages; i++) {
    const s = l.stageElements[i];
    const xPrev = i === 0 ? l.driveNode : l.drivenColumn[i - 1];
    const yPrev = i === 0 ? GROUND : l.smoothingColumn[i - 1];
    const xk = l.drivenColumn[i];
    const yk = l.smoothingColumn[i];
    const expectedDiodes = full ? 4 : 2;
    if (s.diodes.length !== expectedDiodes || !s.pumpC || !s.smoothC || (full && !s.pump2C)) return giveUp(`stage ${i + 1} is missing a part`);
    const pumpC = capacitor(s.pumpC, xPrev, xk);
    const smoothC = capacitor(s.smoothC, yPrev, yk);
    const diodeA = diode(s.diodes[0], yPrev, xk);
    const diodeB = diode(s.diodes[1], xk, yk);
    if (!pumpC || !smoothC || !diodeA || !diodeB) return giveUp(`a part of stage ${i + 1} is not where a stage block puts it (a diode turned round, or a capacitor with more than a series resistor)`);
    const data: StageData = { variant: full ? 'full' : 'half', polarity: l.polarity, pumpC, smoothC, diodeA, diodeB };
    if (full) {
      const x2 = l.secondDrivenColumn as string[];
      const x2Prev = i === 0 ? (l.secondDriveNode as string) : x2[i - 1];
      const pump2C = capacitor(s.pump2C, x2Prev, x2[i]);
      const diodeC = diode(s.diodes[2], yPrev, x2[i]);
      const diodeD = diode(s.diodes[3], x2[i], yk);
      if (!pump2C || !diodeC || !diodeD) return giveUp(`a part of the second driven column in stage ${i + 1} is not where a stage block puts it`);
      Object.assign(data, { pump2C, diodeC, diodeD });
    }
    stages.push(data);
  }

  const drives: Drive[] = [];
  const vNames = l.sourceElements.filter((n) => byName.get(n)?.kind === 'V');
  for (const [vName, hotNode] of [
    [vNames[0], l.driveNode],
    ...(full ? ([[vNames[1], l.secondDriveNode as string]] as const) : []),
  ] as const) {
    const d = readDrive(byName, l.sourceElements, vName, hotNode);
    if (typeof d === 'string') return giveUp(d);
    drives.push(d);
  }
  return { ladder: l, stages, drives, consumed };
}

/** Read a ladder's drive: its V element and the series resistors topology recognition folded into it. */
function readDrive(byName: Map<string, NetlistElement>, sourceElements: string[], vName: string | undefined, hotNode: string): Drive | string {
  const v = vName ? byName.get(vName) : undefined;
  if (!v || v.kind !== 'V' || !v.sine) return 'its drive is not a sine source';
  const s = v.sine;
  if (v.dcV + s.offsetV !== 0) return `its drive ${v.name} has a DC offset, which a drive block does not hold`;
  if (s.delayS !== 0 || s.damping !== 0) return `its drive ${v.name} has a delay or damping, which a drive block does not hold`;
  const series = sourceElements.map((n) => byName.get(n)).filter((e): e is Extract<NetlistElement, { kind: 'R' }> => e?.kind === 'R' && e.nodes.some((n) => n !== GROUND && v.nodes.includes(n)));
  // Each terminal of V reaches the circuit directly or through one series resistor.
  const outer = v.nodes.map((t) => {
    const r = series.find((e) => e.nodes.includes(t) && t !== GROUND);
    return r ? (r.nodes[0] === t ? r.nodes[1] : r.nodes[0]) : t;
  });
  let flip: number;
  if (outer[0] === hotNode && outer[1] === GROUND) flip = 0;
  else if (outer[1] === hotNode && outer[0] === GROUND) flip = 180;
  else return `its drive ${v.name} is not a plain source between the ladder's input and ground`;
  const rs = series.reduce((acc, r) => acc + r.resistanceOhm, 0);
  return {
    v,
    hot: hotNode,
    amplitudeV: Math.abs(s.amplitude),
    phaseDeg: norm360(s.phaseDeg + flip + (s.amplitude < 0 ? 180 : 0)),
    frequencyHz: s.frequencyHz,
    sourceResistanceOhm: rs,
    consumed: [v.name, ...series.map((r) => r.name)],
  };
}

/**
 * The design's stray capacitance when every ladder node has one capacitor to ground of one value
 * (what the compiler adds for `strayCapacitanceF`), and nothing else is a stray; otherwise null
 * and the strays are laid out as single capacitors. Only when every recognised ladder is drawn as
 * stages, since the compiler adds the setting at every ladder it recognises.
 */
function uniformStray(topo: TopologyReport, allDrawn: boolean, byName: Map<string, NetlistElement>): { capacitanceF: number; elements: string[] } | null {
  if (!allDrawn || topo.ladders.length === 0 || topo.strayCapacitors.length === 0) return null;
  const ladderNodes = new Set(topo.ladders.flatMap((l) => [...l.drivenColumn, ...(l.secondDrivenColumn ?? []), ...l.smoothingColumn]));
  const perNode = new Map<string, number[]>();
  const values: number[] = [];
  for (const name of topo.strayCapacitors) {
    const el = byName.get(name);
    if (!el || el.kind !== 'C') return null;
    const node = el.nodes[0] === GROUND ? el.nodes[1] : el.nodes[0];
    if (!ladderNodes.has(node)) return null;
    const list = perNode.get(node) ?? [];
    list.push(el.capacitanceF);
    perNode.set(node, list);
    values.push(el.capacitanceF);
  }
  if (perNode.size !== ladderNodes.size || [...perNode.values()].some((v) => v.length !== 1)) return null;
  if (!values.every((v) => v === values[0])) return null;
  return { capacitanceF: values[0], elements: [...topo.strayCapacitors] };
}

/**
 * A load block for an R or I element. A current load is drawn from its more positive end (what
 * the compiler assumes of every current load); an I element that pushes current into a ladder
 * output instead cannot be a load block and is left out with a warning (returns false).
 */
function placeLoad(lay: Layout, el: NetlistElement, at: { x: number; y: number }, expected: Map<string, number>, warnings: string[]): boolean {
  if (el.kind === 'R') {
    const [a, b] = (expected.get(el.nodes[0]) ?? 0) >= (expected.get(el.nodes[1]) ?? 0) ? el.nodes : [el.nodes[1], el.nodes[0]];
    lay.add({ id: lay.id('load', true), kind: 'load', position: at, label: el.name.slice(0, 80), data: { mode: 'resistor', resistanceOhm: el.resistanceOhm } }, { a, b });
    return true;
  }
  if (el.kind !== 'I') return false;
  if (el.sine && el.sine.amplitude !== 0) warnings.push(`${el.name}: the sine part of the current source is not kept (a load block draws a DC current).`);
  const current = el.dcA + (el.sine?.offsetV ?? 0);
  const [from, to] = current >= 0 ? el.nodes : [el.nodes[1], el.nodes[0]];
  if ((expected.get(from) ?? 0) < (expected.get(to) ?? 0)) {
    warnings.push(`${el.name} pushes current into a ladder output instead of drawing it; a load block cannot do that, so it was left out.`);
    return false;
  }
  lay.add({ id: lay.id('load', true), kind: 'load', position: at, label: el.name.slice(0, 80), data: { mode: 'current', currentA: Math.abs(current) } }, { a: from, b: to });
  return true;
}
