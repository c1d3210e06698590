/**
 * The document's nets: union-find over the ports its wires join, with every ground block's port
 * on one ground net (the compiler names it node 0). `compileDocument` names and stamps these nets
 * and `checkWire` reasons about them, so "these two ports are on one node" means the same thing
 * on the canvas as in the compiled netlist. Wires naming an unknown block or port are skipped
 * (the compiler reports them).
 */
import { portsOf, type DesignDocument } from './schema';

/** A port of a block. */
export interface PortRef {
  blockId: string;
  port: string;
}

/** The grouping of a document's ports into nets. */
export interface DocumentNets {
  /** Net key of a port (stable within one grouping), or undefined for an unknown block or port. */
  netOf(blockId: string, port: string): string | undefined;
  /** Whether the net is the ground node (holds a ground block's port). */
  isGround(net: string): boolean;
  /** Every port on the net, in document order. */
  members(net: string): PortRef[];
  /** Every net, in the order of its first port (blocks in document order, then their ports). */
  nets(): string[];
}

const GROUND_NET = 'ground';
const portKey = (blockId: string, port: string) => `${blockId}\u0000${port}`;

/** Group the document's ports into nets (see the module header). */
export function documentNets(doc: DesignDocument): DocumentNets {
  const parent = new Map<string, string>();
  parent.set(GROUND_NET, GROUND_NET);
  for (const b of doc.blocks) for (const p of portsOf(b)) parent.set(portKey(b.id, p), b.kind === 'ground' ? GROUND_NET : portKey(b.id, p));
  const find = (k: string): string => {
    let r = k;
    while (parent.get(r) !== r) r = parent.get(r) as string;
    let c = k;
    while (parent.get(c) !== r) {
      const next = parent.get(c) as string;
      parent.set(c, r);
      c = next;
    }
    return r;
  };
  const union = (a: string, b: string) => {
    const ra = find(a);
    const rb = find(b);
    if (ra === rb) return;
    // The ground net keeps its key so isGround stays a key comparison.
    if (ra === GROUND_NET) parent.set(rb, ra);
    else parent.set(ra, rb);
  };
  for (const w of doc.wires) {
    const a = portKey(w.source, w.sourcePort);
    const b = portKey(w.target, w.targetPort);
    if (parent.has(a) && parent.has(b)) union(a, b);
  }
  const byNet = new Map<string, PortRef[]>();
  for (const b of doc.blocks) {
    for (const p of portsOf(b)) {
      const r = find(portKey(b.id, p));
      let list = byNet.get(r);
      if (!list) byNet.set(r, (list = []));
      list.push({ blockId: b.id, port: p });
    }
  }
  return {
    netOf: (blockId, port) => (parent.has(portKey(blockId, port)) ? find(portKey(blockId, port)) : undefined),
    isGround: (net) => net === GROUND_NET,
    members: (net) => byNet.get(net) ?? [],
    nets: () => [...byNet.keys()],
  };
}
