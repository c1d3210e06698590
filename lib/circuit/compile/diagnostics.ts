/**
 * Typed diagnostics of the compiler and of topology recognition. Each one names what the canvas
 * should highlight: the netlist element, the node, and — when the netlist came from a canvas
 * document — the block and the stage it belongs to.
 *
 * Severity rule: `error` means the circuit cannot be solved as drawn (compile returns
 * `ok: false`); `warning` is a design fault that still solves (reversed diode, missing part,
 * overload); `info` is a remark (unrecognised "custom" shape).
 */
import type { Netlist } from '../netlist/types';

/** What went wrong; the canvas picks its wording and highlight from the code. */
export type DiagnosticCode =
  | 'reversed-diode'
  | 'missing-diode'
  | 'missing-capacitor'
  | 'shorted-capacitor'
  | 'floating-node'
  | 'no-dc-path'
  | 'no-ground'
  | 'shorted-source'
  | 'non-positive-value'
  | 'overload'
  | 'unconnected-port'
  | 'unknown-port'
  | 'custom-topology'
  | 'no-drive'
  | 'mixed-frequency'
  | 'shorted-part';

/** `error`: cannot be solved as drawn; `warning`: solves but is a design fault; `info`: a remark. */
export type DiagnosticSeverity = 'error' | 'warning' | 'info';

/** One finding, with the element, node, block and stage the canvas should highlight. */
export interface Diagnostic {
  code: DiagnosticCode;
  severity: DiagnosticSeverity;
  message: string;
  /** Netlist element name at fault. */
  element?: string;
  /** Netlist node name at fault. */
  node?: string;
  /** Canvas block id at fault (filled from the element's or node's canvas origin). */
  blockId?: string;
  /** 1-based stage number (bottom stage = 1) within its ladder. */
  stage?: number;
}

/** True when any diagnostic is an error. */
export function hasErrors(diagnostics: Diagnostic[]): boolean {
  return diagnostics.some((d) => d.severity === 'error');
}

/**
 * Fill `blockId` from the netlist's canvas origins (element origin first, then the node's first
 * port), so diagnostics found on the netlist graph map back to the canvas.
 */
export function attachOrigins(diagnostics: Diagnostic[], netlist: Netlist): Diagnostic[] {
  const byName = new Map(netlist.elements.map((e) => [e.name, e] as const));
  return diagnostics.map((d) => {
    if (d.blockId !== undefined) return d;
    const el = d.element ? byName.get(d.element) : undefined;
    if (el?.origin) return { ...d, blockId: el.origin.blockId };
    const ports = d.node ? netlist.nodeOrigins?.[d.node] : undefined;
    if (ports && ports.length > 0) return { ...d, blockId: ports[0].blockId };
    return d;
  });
}
