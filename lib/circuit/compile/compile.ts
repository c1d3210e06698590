/**
 * Canvas document → netlist compiler. Wired ports are grouped into nets by `documentNets`
 * (union-find, shared with the canvas's wire check); the ground net is node `0`; ladder nets are named from their stage block and port
 * (`x_<id>`, `y_<id>`, `x2_<id>`), source nets `<id>_<port>`, all others `n_<blockId>_<port>`,
 * so names stay stable while the drawing is edited. Everything the canvas adds beyond the SPICE
 * subset becomes plain R and C elements: source resistance and capacitor ESR in series through an
 * internal node, stray capacitance to ground at every ladder node, a bleeder across each output.
 * RMS amplitudes become peaks (×√2, sine). A current load always loads the ladder: its I element
 * is oriented to draw from the more positive end (so on a negative output it points into the
 * output). Each element carries its canvas origin
 * `{ blockId, role }`, each net its ports in `nodeOrigins`.
 */
import { GROUND, type DiodeModel, type Netlist, type NetlistElement, type SineSpec } from '../netlist/types';
import { defaultDiodeModel } from '../netlist/parse';
import { portsOf, type DesignBlock, type DesignDocument, type DiodeModelParams } from '../document/schema';
import { documentNets } from '../document/nets';
import { attachOrigins, hasErrors, type Diagnostic } from './diagnostics';
import { recognizeTopology, type TopologyReport } from './topology';

/** Compiler outcome; `ok: false` whenever a diagnostic has severity `error` (`reason` is the first one). */
export type CompileResult =
  | { ok: true; netlist: Netlist; topology: TopologyReport; diagnostics: Diagnostic[] }
  | { ok: false; reason: string; diagnostics: Diagnostic[] };

type Port = { blockId: string; port: string };

const key = (blockId: string, port: string) => `${blockId}\u0000${port}`;

/** Compile a canvas document into a netlist plus its recognised topology and diagnostics. */
export function compileDocument(doc: DesignDocument): CompileResult {
  const diagnostics: Diagnostic[] = [];
  const blocks = doc.blocks;
  const byId = new Map(blocks.map((b) => [b.id, b] as const));

  // Nets: the document's shared port grouping (grounds on one net).
  const nets = documentNets(doc);
  const allPorts: Port[] = blocks.flatMap((b) => portsOf(b).map((port) => ({ blockId: b.id, port })));
  const wired = new Set<string>();
  for (const w of doc.wires) {
    let bad = false;
    for (const [blockId, port] of [
      [w.source, w.sourcePort],
      [w.target, w.targetPort],
    ] as const) {
      if (nets.netOf(blockId, port) === undefined) {
        bad = true;
        diagnostics.push({
          code: 'unknown-port',
          severity: 'error',
          blockId: byId.has(blockId) ? blockId : undefined,
          message: byId.has(blockId) ? `wire ${w.id}: block ${blockId} has no port "${port}"` : `wire ${w.id}: unknown block ${blockId}`,
        });
      }
    }
    if (bad) continue;
    wired.add(key(w.source, w.sourcePort));
    wired.add(key(w.target, w.targetPort));
  }
  const members = new Map<string, Port[]>(nets.nets().map((n) => [n, nets.members(n)]));
  const netName = new Map<string, string>();
  const taken = new Set<string>([GROUND]);
  for (const [root, ports] of members) {
    let best: { rank: number; name: string } | null = null;
    for (const p of ports) {
      const b = byId.get(p.blockId) as DesignBlock;
      let cand: { rank: number; name: string };
      if (b.kind === 'ground') cand = { rank: 0, name: GROUND };
      else if (b.kind === 'stage' && p.port.endsWith('Out')) cand = { rank: 1, name: `${p.port.slice(0, -3)}_${b.id}` };
      else if (b.kind === 'acSource' || b.kind === 'dcSource') cand = { rank: 2, name: `${b.id}_${p.port}` };
      else cand = { rank: 3, name: `n_${b.id}_${p.port}` };
      if (!best || cand.rank < best.rank) best = cand;
    }
    let name = (best as { name: string }).name;
    if (name !== GROUND) {
      const base = name;
      for (let i = 2; taken.has(name); i++) name = `${base}_${i}`;
      taken.add(name);
    }
    netName.set(root, name);
  }
  const net = (blockId: string, port: string) => netName.get(nets.netOf(blockId, port) as string) as string;
  const nodeOrigins: Record<string, Port[]> = {};
  for (const [root, ports] of members) {
    const name = netName.get(root) as string;
    (nodeOrigins[name] ??= []).push(...ports);
  }

  // Unconnected ports: open ends of discrete parts and unfed stage inputs.
  for (const p of allPorts) {
    const b = byId.get(p.blockId) as DesignBlock;
    if (wired.has(key(p.blockId, p.port)) || b.kind === 'ground') continue;
    if (b.kind === 'stage' && p.port.endsWith('Out')) continue;
    diagnostics.push({
      code: 'unconnected-port',
      severity: 'warning',
      blockId: b.id,
      node: net(p.blockId, p.port),
      message: `${b.label ?? b.id}: port ${p.port} is not wired`,
    });
  }

  // Elements.
  const elements: NetlistElement[] = [];
  const models: Record<string, DiodeModel> = {};
  const modelKeys = new Map<string, string>();
  const modelFor = (params: DiodeModelParams): string => {
    const k = JSON.stringify([params.isA, params.n, params.rsOhm, params.bvV ?? null, params.cjoF ?? 0, params.ttS ?? 0]);
    let name = modelKeys.get(k);
    if (!name) {
      name = `DMOD${modelKeys.size + 1}`;
      modelKeys.set(k, name);
      const m = defaultDiodeModel(name);
      m.isA = params.isA;
      m.n = params.n;
      m.rsOhm = params.rsOhm;
      if (params.bvV !== undefined) m.bvV = params.bvV;
      if (params.cjoF !== undefined) m.cjoF = params.cjoF;
      if (params.ttS !== undefined) m.ttS = params.ttS;
      models[name.toUpperCase()] = m;
    }
    return name;
  };
  const internal = (blockId: string, role: string): string => {
    let name = `i_${blockId}_${role}`;
    for (let i = 2; taken.has(name); i++) name = `i_${blockId}_${role}_${i}`;
    taken.add(name);
    nodeOrigins[name] = [{ blockId, port: `${role}:internal` }];
    return name;
  };
  const positive = (v: number, blockId: string, what: string): boolean => {
    if (v > 0 && Number.isFinite(v)) return true;
    diagnostics.push({ code: 'non-positive-value', severity: 'error', blockId, message: `${blockId}: ${what} must be a positive number (got ${v})` });
    return false;
  };

  const push = (el: NetlistElement) => {
    if (el.nodes[0] === el.nodes[1]) {
      const blockId = el.origin?.blockId;
      if (el.kind === 'V') diagnostics.push({ code: 'shorted-source', severity: 'error', blockId, node: el.nodes[0], element: el.name, message: `${blockId}: the source terminals are wired together (shorted)` });
      else if (el.kind === 'C') diagnostics.push({ code: 'shorted-capacitor', severity: 'warning', blockId, node: el.nodes[0], element: el.name, message: `${blockId}: capacitor ${el.origin?.role ?? el.name} is shorted by the wiring (both ends on ${el.nodes[0]})` });
      else diagnostics.push({ code: 'shorted-part', severity: 'warning', blockId, node: el.nodes[0], element: el.name, message: `${blockId}: ${el.origin?.role ?? el.name} has both ends on ${el.nodes[0]} and does nothing` });
      return;
    }
    elements.push(el);
  };

  const capacitor = (b: DesignBlock, role: string, spec: { capacitanceF: number; esrOhm?: number }, a: string, c: string, elName: string) => {
    if (!positive(spec.capacitanceF, b.id, `${role} capacitance`)) return;
    const esr = spec.esrOhm ?? 0;
    if (esr > 0 && a !== c) {
      const mid = internal(b.id, role);
      push({ kind: 'C', name: elName, nodes: [a, mid], capacitanceF: spec.capacitanceF, origin: { blockId: b.id, role } });
      push({ kind: 'R', name: `Resr_${role}_${b.id}`, nodes: [mid, c], resistanceOhm: esr, origin: { blockId: b.id, role: `${role}.esr` } });
    } else {
      push({ kind: 'C', name: elName, nodes: [a, c], capacitanceF: spec.capacitanceF, origin: { blockId: b.id, role } });
    }
  };
  const source = (b: DesignBlock, role: string, name: string, hot: string, ret: string, rs: number, dcV: number, sine?: SineSpec) => {
    let plus = hot;
    if (rs > 0 && hot !== ret) {
      plus = internal(b.id, role);
      push({ kind: 'R', name: `Rs_${role}_${b.id}`, nodes: [plus, hot], resistanceOhm: rs, origin: { blockId: b.id, role: `${role}.rs` } });
    }
    push({ kind: 'V', name, nodes: [plus, ret], dcV, ...(sine ? { sine } : {}), origin: { blockId: b.id, role } });
  };

  for (const b of blocks) {
    switch (b.kind) {
      case 'ground':
        break;
      case 'acSource': {
        const d = b.data;
        if (!positive(d.amplitudeV, b.id, 'amplitude') || !positive(d.frequencyHz, b.id, 'frequency')) break;
        const peak = d.amplitudeMode === 'rms' ? d.amplitudeV * Math.SQRT2 : d.amplitudeV;
        const phase = d.phaseDeg ?? 0;
        const rs = d.sourceResistanceOhm ?? 0;
        const sine = (p: number) => ({ offsetV: 0, amplitude: peak, frequencyHz: d.frequencyHz, delayS: 0, damping: 0, phaseDeg: p });
        if (d.variant === 'single') source(b, 'source', `V_${b.id}`, net(b.id, 'hot'), net(b.id, 'ret'), rs, 0, sine(phase));
        else {
          const ct = net(b.id, 'ct');
          source(b, 'sourceA', `Va_${b.id}`, net(b.id, 'hot'), ct, rs, 0, sine(phase));
          source(b, 'sourceB', `Vb_${b.id}`, net(b.id, 'hotB'), ct, rs, 0, sine((phase + 180) % 360));
        }
        break;
      }
      case 'dcSource':
        source(b, 'source', `V_${b.id}`, net(b.id, 'pos'), net(b.id, 'neg'), b.data.sourceResistanceOhm ?? 0, b.data.voltageV);
        break;
      case 'stage': {
        const d = b.data;
        const x = (p: string) => net(b.id, p);
        const diode = (role: string, spec: { model: DiodeModelParams }, anode: string, cathode: string) => {
          const [an, ca] = d.polarity === 'positive' ? [anode, cathode] : [cathode, anode];
          push({ kind: 'D', name: `D${role.slice(-1)}_${b.id}`, nodes: [an, ca], model: modelFor(spec.model), origin: { blockId: b.id, role } });
        };
        capacitor(b, 'pumpC', d.pumpC, x('xIn'), x('xOut'), `Cpump_${b.id}`);
        capacitor(b, 'smoothC', d.smoothC, x('yIn'), x('yOut'), `Csmooth_${b.id}`);
        diode('diodeA', d.diodeA, x('yIn'), x('xOut'));
        diode('diodeB', d.diodeB, x('xOut'), x('yOut'));
        if (d.variant === 'full') {
          const p2 = d.pump2C ?? d.pumpC;
          capacitor(b, 'pump2C', p2, x('x2In'), x('x2Out'), `Cpump2_${b.id}`);
          diode('diodeC', d.diodeC ?? d.diodeA, x('yIn'), x('x2Out'));
          diode('diodeD', d.diodeD ?? d.diodeB, x('x2Out'), x('yOut'));
        }
        break;
      }
      case 'load':
        if (b.data.mode === 'resistor') {
          if (positive(b.data.resistanceOhm, b.id, 'load resistance')) push({ kind: 'R', name: `Rload_${b.id}`, nodes: [net(b.id, 'a'), net(b.id, 'b')], resistanceOhm: b.data.resistanceOhm, origin: { blockId: b.id, role: 'load' } });
        } else {
          push({ kind: 'I', name: `Iload_${b.id}`, nodes: [net(b.id, 'a'), net(b.id, 'b')], dcA: b.data.currentA, origin: { blockId: b.id, role: 'load' } });
        }
        break;
      case 'capacitor':
        capacitor(b, 'capacitor', b.data, net(b.id, 'a'), net(b.id, 'b'), `C_${b.id}`);
        break;
      case 'resistor':
        if (positive(b.data.resistanceOhm, b.id, 'resistance')) push({ kind: 'R', name: `R_${b.id}`, nodes: [net(b.id, 'a'), net(b.id, 'b')], resistanceOhm: b.data.resistanceOhm, origin: { blockId: b.id, role: 'resistor' } });
        break;
      case 'diode':
        push({ kind: 'D', name: `D_${b.id}`, nodes: [net(b.id, 'anode'), net(b.id, 'cathode')], model: modelFor(b.data.model), origin: { blockId: b.id, role: 'diode' } });
        break;
    }
  }

  let core: Netlist = { title: 'Kilorung design', elements, models, ignored: [], nodeOrigins };
  let first = recognizeTopology(core);

  // A current load draws from its more positive end: on a negative ladder output it is turned round.
  const expected = new Map<string, number>(first.ladders.map((l) => [l.outputNode, (l.polarity === 'positive' ? 1 : -1) * 2 * l.stages * l.drivePeakV] as const));
  let flipped = false;
  const oriented = elements.map((el) => {
    if (el.kind !== 'I' || el.origin?.role !== 'load') return el;
    const [a, b] = el.nodes;
    if ((expected.get(a) ?? 0) >= (expected.get(b) ?? 0)) return el;
    flipped = true;
    return { ...el, nodes: [b, a] as [string, string] };
  });
  if (flipped) {
    core = { ...core, elements: oriented };
    first = recognizeTopology(core);
  }

  // Stray capacitance at every ladder node (or every part net when no ladder is recognised), bleeders at the outputs.
  const stray = doc.settings?.strayCapacitanceF ?? 0;
  const extra: NetlistElement[] = [];
  if (stray > 0) {
    const nodes =
      first.ladders.length > 0
        ? first.ladders.flatMap((l) => [...l.drivenColumn, ...(l.secondDrivenColumn ?? []), ...l.smoothingColumn])
        : Object.keys(nodeOrigins).filter((n) => n !== GROUND && nodeOrigins[n].some((p) => ['stage', 'capacitor', 'diode'].includes(byId.get(p.blockId)?.kind ?? '') && !p.port.endsWith(':internal')));
    for (const n of [...new Set(nodes)]) {
      if (n === GROUND) continue;
      extra.push({ kind: 'C', name: `Cstray_${n}`, nodes: [n, GROUND], capacitanceF: stray, origin: { blockId: nodeOrigins[n]?.[0]?.blockId ?? 'settings', role: 'stray' } });
    }
  }
  const bleeder = doc.settings?.bleederOhm;
  if (bleeder !== undefined && bleeder > 0) {
    const loads = blocks.filter((b) => b.kind === 'load');
    const outs =
      first.outputs.length > 0
        ? first.outputs.map((o) => o.node)
        : loads.flatMap((b) => [net(b.id, 'a'), net(b.id, 'b')]).filter((n) => n !== GROUND);
    for (const n of [...new Set(outs)]) {
      extra.push({ kind: 'R', name: `Rbleed_${n}`, nodes: [n, GROUND], resistanceOhm: bleeder, origin: { blockId: nodeOrigins[n]?.[0]?.blockId ?? 'settings', role: 'bleeder' } });
    }
  }
  const netlist: Netlist = extra.length > 0 ? { ...core, elements: [...core.elements, ...extra] } : core;
  const topology = extra.length > 0 ? recognizeTopology(netlist) : first;

  const reportedOpen = new Set(diagnostics.filter((d) => d.code === 'unconnected-port').map((d) => d.node));
  const fromTopology = topology.diagnostics.filter((d) => !(d.code === 'floating-node' && d.severity === 'warning' && reportedOpen.has(d.node)));
  const all = attachOrigins([...diagnostics, ...fromTopology], netlist);
  const stageOfBlock = stagesByBlock(topology, netlist);
  const withStages = all.map((d) => (d.stage === undefined && d.blockId !== undefined && stageOfBlock.has(d.blockId) ? { ...d, stage: stageOfBlock.get(d.blockId) } : d));
  if (hasErrors(withStages)) {
    const firstError = withStages.find((d) => d.severity === 'error') as Diagnostic;
    return { ok: false, reason: firstError.message, diagnostics: withStages };
  }
  return { ok: true, netlist, topology, diagnostics: withStages };
}

/** Stage number of every block that holds a recognised stage part (via the parts' canvas origins). */
function stagesByBlock(topology: TopologyReport, netlist: Netlist): Map<string, number> {
  const byName = new Map(netlist.elements.map((e) => [e.name, e] as const));
  const out = new Map<string, number>();
  for (const l of topology.ladders) {
    for (const s of l.stageElements) {
      for (const name of [s.pumpC, s.smoothC, s.pump2C, ...s.diodes]) {
        const blockId = name ? byName.get(name)?.origin?.blockId : undefined;
        if (blockId !== undefined && !out.has(blockId)) out.set(blockId, s.stage);
      }
    }
  }
  return out;
}
