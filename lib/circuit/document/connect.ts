/**
 * Connection rules the canvas applies before it adds a wire. The document's nets are grouped the
 * way `compileDocument` groups them (union-find over wired ports, every ground block on node 0),
 * so "these two ports are on one node" means the same thing here as in the compiled netlist. A
 * wire is refused when it cannot make electrical sense: it joins a port to itself or to a node it
 * is already on, puts both ends of a part on one node (a short), closes a loop of voltage
 * sources, ties two sources' outputs together, or joins two ports of one block.
 */
import { documentNets } from './nets';
import { portsOf, type DesignBlock, type DesignDocument } from './schema';

export { documentNets, type DocumentNets } from './nets';

/** A wire the canvas wants to add (ports by block id and port name; direction does not matter). */
export type WireCandidate = { source: string; sourcePort: string; target: string; targetPort: string };

/** Outcome of {@link checkWire}: accepted, or refused with one plain sentence naming the parts. */
export type WireCheck = { ok: true } | { ok: false; reason: string };

/** A two-terminal part inside a block (what the compiler turns into one netlist element). */
export interface BlockPart {
  /** Role as in the compiled element's origin (`pumpC`, `diodeA`, `source`, `load`, ...). */
  role: string;
  kind: 'C' | 'D' | 'R' | 'V' | 'I';
  /** The block ports its two ends sit on. */
  ends: [string, string];
  /** Reads after "short": "the pumping capacitor of Stage 2". */
  description: string;
}

const PORT_WORDS: Record<string, string> = {
  xIn: 'driven-column input',
  xOut: 'driven-column output',
  x2In: 'second driven-column input',
  x2Out: 'second driven-column output',
  yIn: 'smoothing-column input',
  yOut: 'smoothing-column output',
  hot: 'hot output',
  hotB: 'second hot output',
  ret: 'return',
  ct: 'centre tap',
  pos: '+ terminal',
  neg: '− terminal',
  a: 'end a',
  b: 'end b',
  anode: 'anode',
  cathode: 'cathode',
  g: 'ground terminal',
};

/** Plain words for a port name (`xOut` → "driven-column output"). */
export function portWords(port: string): string {
  return PORT_WORDS[port] ?? port;
}

/** Display name of a block in messages: its label, with the id added when another block shares the label. */
export function blockName(doc: DesignDocument, block: DesignBlock): string {
  const label = block.label?.trim();
  if (!label) return block.id;
  return doc.blocks.some((b) => b !== block && b.label?.trim() === label) ? `${label} (${block.id})` : label;
}

/** The two-terminal parts of a block with the ports their ends sit on (the schema header's stage wiring). */
export function blockParts(block: DesignBlock, name: string): BlockPart[] {
  const part = (role: string, kind: BlockPart['kind'], a: string, b: string, description: string): BlockPart => ({ role, kind, ends: [a, b], description });
  switch (block.kind) {
    case 'stage': {
      const parts = [
        part('pumpC', 'C', 'xIn', 'xOut', `the pumping capacitor of ${name}`),
        part('smoothC', 'C', 'yIn', 'yOut', `the smoothing capacitor of ${name}`),
        part('diodeA', 'D', 'yIn', 'xOut', `diode A of ${name}`),
        part('diodeB', 'D', 'xOut', 'yOut', `diode B of ${name}`),
      ];
      if (block.data.variant === 'full') {
        parts.push(
          part('pump2C', 'C', 'x2In', 'x2Out', `the second pumping capacitor of ${name}`),
          part('diodeC', 'D', 'yIn', 'x2Out', `diode C of ${name}`),
          part('diodeD', 'D', 'x2Out', 'yOut', `diode D of ${name}`),
        );
      }
      return parts;
    }
    case 'acSource':
      return block.data.variant === 'single'
        ? [part('source', 'V', 'hot', 'ret', name)]
        : [part('sourceA', 'V', 'hot', 'ct', `the first half of ${name}`), part('sourceB', 'V', 'hotB', 'ct', `the second half of ${name}`)];
    case 'dcSource':
      return [part('source', 'V', 'pos', 'neg', name)];
    case 'load':
      return [part('load', block.data.mode === 'resistor' ? 'R' : 'I', 'a', 'b', name)];
    case 'capacitor':
      return [part('capacitor', 'C', 'a', 'b', name)];
    case 'resistor':
      return [part('resistor', 'R', 'a', 'b', name)];
    case 'diode':
      return [part('diode', 'D', 'anode', 'cathode', name)];
    case 'ground':
      return [];
  }
}

/** The document's nets: which ports share a node once the wires are drawn. */
/** Ports of a source that drive the circuit (the ones two sources must not share). */
function isSourceOutput(block: DesignBlock, port: string): boolean {
  return (block.kind === 'acSource' && (port === 'hot' || port === 'hotB')) || (block.kind === 'dcSource' && port === 'pos');
}

/**
 * Whether a wire may be added to the document. Refused, with a reason naming the parts, when it
 * names an unknown block or port, joins a port to itself, repeats a wire, joins two ports already
 * on one node, would put both ends of a part (stage capacitor or diode, single part, load, source)
 * on one node, would close a loop of voltage sources, would tie the outputs of two sources together,
 * or would join two ports of the same block.
 */
export function checkWire(doc: DesignDocument, w: WireCandidate): WireCheck {
  const byId = new Map(doc.blocks.map((b) => [b.id, b] as const));
  const src = byId.get(w.source);
  const dst = byId.get(w.target);
  if (!src) return { ok: false, reason: `There is no block "${w.source}" on the canvas.` };
  if (!dst) return { ok: false, reason: `There is no block "${w.target}" on the canvas.` };
  // Labels counted once: naming every part through blockName would rescan the blocks per part.
  const labelCount = new Map<string, number>();
  for (const b of doc.blocks) {
    const l = b.label?.trim();
    if (l) labelCount.set(l, (labelCount.get(l) ?? 0) + 1);
  }
  const name = (b: DesignBlock) => {
    const l = b.label?.trim();
    if (!l) return b.id;
    return (labelCount.get(l) ?? 0) > 1 ? `${l} (${b.id})` : l;
  };
  for (const [b, p] of [
    [src, w.sourcePort],
    [dst, w.targetPort],
  ] as const) {
    if (!portsOf(b).includes(p)) return { ok: false, reason: `${name(b)} has no port "${p}".` };
  }
  const end = (b: DesignBlock, p: string) => (b.kind === 'ground' ? name(b) : `the ${portWords(p)} of ${name(b)}`);
  const endA = end(src, w.sourcePort);
  const endB = end(dst, w.targetPort);
  if (src === dst && w.sourcePort === w.targetPort) return { ok: false, reason: `A wire needs two different ports; both ends are on ${endA}.` };
  const duplicate = doc.wires.some(
    (x) =>
      (x.source === w.source && x.sourcePort === w.sourcePort && x.target === w.target && x.targetPort === w.targetPort) ||
      (x.source === w.target && x.sourcePort === w.targetPort && x.target === w.source && x.targetPort === w.sourcePort),
  );
  if (duplicate) return { ok: false, reason: `${capitalise(endA)} and ${endB} are already wired together.` };

  const nets = documentNets(doc);
  const a = nets.netOf(w.source, w.sourcePort) as string;
  const b = nets.netOf(w.target, w.targetPort) as string;
  if (a === b) return { ok: false, reason: `${capitalise(endA)} and ${endB} are already on the same node${nets.isGround(a) ? ' (ground)' : ''}.` };

  // Parts whose two ends would land on the merged node; sources first, they are the worst short.
  const parts = doc.blocks.flatMap((blk) => blockParts(blk, name(blk)).map((p) => ({ block: blk, part: p })));
  parts.sort((x, y) => Number(y.part.kind === 'V') - Number(x.part.kind === 'V'));
  for (const { block, part } of parts) {
    const n0 = nets.netOf(block.id, part.ends[0]);
    const n1 = nets.netOf(block.id, part.ends[1]);
    if ((n0 === a && n1 === b) || (n0 === b && n1 === a)) return { ok: false, reason: `This wire would short ${part.description}.` };
  }

  // Voltage sources already joining the two nodes: the wire would close a loop of sources.
  const vParent = new Map<string, string>();
  const vFind = (n: string): string => {
    let r = n;
    while (vParent.has(r) && vParent.get(r) !== r) r = vParent.get(r) as string;
    return r;
  };
  const sources = parts.filter((x) => x.part.kind === 'V');
  for (const { block, part } of sources) {
    const r0 = vFind(nets.netOf(block.id, part.ends[0]) as string);
    const r1 = vFind(nets.netOf(block.id, part.ends[1]) as string);
    if (r0 !== r1) vParent.set(r0, r1);
  }
  if (vFind(a) === vFind(b)) {
    const loop = vFind(a);
    const involved = [...new Set(sources.filter((x) => vFind(nets.netOf(x.block.id, x.part.ends[0]) as string) === loop).map((x) => name(x.block)))];
    return {
      ok: false,
      reason:
        involved.length === 1
          ? `This wire would join the two hot outputs of ${involved[0]} and short its windings.`
          : `This wire would close a loop of voltage sources through ${listWords(involved)}, which shorts them.`,
    };
  }

  // Two different sources' outputs on one node fight each other.
  const outputsOn = (net: string) => new Set(nets.members(net).filter((m) => isSourceOutput(byId.get(m.blockId) as DesignBlock, m.port)).map((m) => m.blockId));
  for (const x of outputsOn(a)) {
    for (const y of outputsOn(b)) {
      if (x !== y) return { ok: false, reason: `This wire would tie the outputs of ${name(byId.get(x) as DesignBlock)} and ${name(byId.get(y) as DesignBlock)} together.` };
    }
  }

  if (src === dst) {
    return { ok: false, reason: `This wire would join two ports of ${name(src)} (its ${portWords(w.sourcePort)} and ${portWords(w.targetPort)}), which bypasses its own parts.` };
  }
  return { ok: true };
}

function capitalise(s: string): string {
  return s.charAt(0).toUpperCase() + s.slice(1);
}

function listWords(items: string[]): string {
  return items.length <= 2 ? items.join(' and ') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}
