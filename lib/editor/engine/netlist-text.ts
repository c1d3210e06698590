/**
 * The one netlist the editor hands to the solver and to "export netlist": the compiled document
 * written as SPICE-subset text (`formatNetlist`) and read back with the same parser
 * `npm run solve` uses. The worker solves the read-back netlist, so the figures on the canvas are
 * the ones the command line prints for the exported file (same elements, same node names, same
 * numbers: `formatNetlist` writes shortest round-trip decimals).
 */
import {
  compileDocument,
  formatNetlist,
  parseNetlist,
  recognizeTopology,
  type CompileResult,
  type DesignDocument,
  type Netlist,
  type TopologyReport,
} from '@/lib/circuit';

/** Title line of an exported netlist when the design has no title of its own. */
export const DEFAULT_NETLIST_TITLE = 'Kilorung design';

/**
 * The caution written under the title of every exported netlist (SPICE `*` comment): these
 * supplies store a lethal charge, and the file is a simulation input, not a safety approval.
 */
export const NETLIST_CAUTION =
  'CAUTION: high voltage. Capacitor ladders hold a lethal charge after switch-off; discharge and ground every stage before touching. Simulation figures are not a safety approval: follow local electrical codes and licensed practice.';

/** The SPICE title line: one line, trimmed, never empty (the parser takes line 1 as the title). */
function titleLine(title: string | undefined): string {
  const t = (title ?? '').replace(/[\r\n]+/g, ' ').trim();
  return t.length > 0 ? t.slice(0, 200) : DEFAULT_NETLIST_TITLE;
}

/**
 * SPICE text of a compiled netlist: the design title on line 1 (SPICE's title line), then `*`
 * comment lines naming the tool and the caution, then `formatNetlist`'s cards.
 */
export function netlistTextOf(netlist: Netlist, title?: string): string {
  const body = formatNetlist({ ...netlist, title: titleLine(title) });
  const newline = body.indexOf('\n');
  const head = body.slice(0, newline);
  const rest = body.slice(newline + 1);
  const comments = ['* Exported by Kilorung (SPICE subset: R C D V I, .model D).', `* ${NETLIST_CAUTION}`];
  return `${head}\n${comments.join('\n')}\n${rest}`;
}

/** A document prepared for the solver: its compile, the exported text and that text read back. */
export type PreparedNetlist =
  | {
      ok: true;
      compiled: CompileResult & { ok: true };
      text: string;
      /** The netlist parsed back from `text`: what the worker and `npm run solve` both solve. */
      netlist: Netlist;
      /** Topology of the read-back netlist (its outputs are the solve's output nodes, as in scripts/solve.ts). */
      topology: TopologyReport;
    }
  | { ok: false; reason: string; compiled: CompileResult };

/** Compile `doc`, write its netlist text and read it back (the `npm run solve` path for that file). */
export function prepareNetlist(doc: DesignDocument, title?: string): PreparedNetlist {
  const compiled = compileDocument(doc);
  if (!compiled.ok) return { ok: false, reason: compiled.reason, compiled };
  const text = netlistTextOf(compiled.netlist, title);
  const parsed = parseNetlist(text);
  if (!parsed.ok) {
    const first = parsed.errors[0];
    return { ok: false, reason: `the exported netlist does not read back (line ${first?.line}: ${first?.message})`, compiled };
  }
  return { ok: true, compiled, text, netlist: parsed.netlist, topology: recognizeTopology(parsed.netlist) };
}
