/**
 * What an engine worker does with one request, as a plain function of the request and a `post`
 * callback (the worker script only wires it to `self`; tests call it directly):
 * - `compile`: compileDocument → compile view, then the closed-form estimate (estimateFromNetlist);
 * - `solve`: the exported netlist read back (see `netlist-text.ts`) → solveNetlist for the
 *   periodic steady state with the options `npm run solve` uses (output nodes from the read-back
 *   netlist's topology), posted at once; then the warm-up from power-on, posted as a second reply.
 * Expected failures are replies (`cannot-solve` with the reason), never exceptions.
 */
import { compileDocument, estimateFromNetlist, fullWaveStarter, solveNetlist, type DesignDocument, type Netlist, type SolveResult } from '@/lib/circuit';
import { buildCircuit, driveAmplitudeV } from '@/lib/circuit/mna/circuit';
import { warmupFromPowerOn } from '@/lib/circuit/analysis/warmup';
import type { SolveView } from '../types';
import { engineRequestSchema, firstIssue, SOLVE_BUDGET_MS, WARMUP_BUDGET_MS, WAVEFORM_POINTS, type EngineReply } from './protocol';
import { prepareNetlist } from './netlist-text';
import { compileView, solveView } from './view-model';

type Post = (reply: EngineReply) => void;
type Warmup = NonNullable<SolveView['warmup']>;

/**
 * The warm-up transient from power-on for a solved netlist, by the engine's envelope following
 * (`warmupFromPowerOn`), with the step control `solveNetlist({ warmup: true })` uses, so the
 * curve and the 90 %/99 % times are the ones the command line reports — without solving the
 * steady state a second time.
 */
export function warmupAfterSolve(netlist: Netlist, solve: SolveResult & { ok: true }, budgetMs = WARMUP_BUDGET_MS): { ok: true; warmup: Warmup; reason?: string } | { ok: false; reason: string } {
  if (!(solve.periodS > 0)) return { ok: false, reason: 'no AC drive: a DC circuit has no warm-up cycles' };
  const output = solve.outputs[0];
  if (!output || !solve.nodes[output.node]) return { ok: false, reason: 'no output node to follow' };
  const built = buildCircuit(netlist);
  if (!built.ok) return { ok: false, reason: built.reason };
  const circuit = built.circuit;
  const periodS = solve.periodS;
  const amplitude = driveAmplitudeV(circuit);
  const vScale = amplitude > 0 ? amplitude : 1;
  const w = warmupFromPowerOn(circuit, {
    periodS,
    outputNode: output.node,
    finalMeanV: solve.nodes[output.node].mean,
    control: { hMaxS: periodS / 40, hMinS: periodS * 1e-9, hInitS: periodS * 1e-4, lteRel: 2e-5, lteAbsV: 1e-8 * vScale, vScaleV: vScale, deadlineMs: performance.now() + budgetMs },
    bruteCycles: Math.max(8, circuit.diodes.length),
  });
  if (!w.ok) return { ok: false, reason: w.reason };
  const r = w.result;
  return {
    ok: true,
    warmup: { t90S: r.t90, t99S: r.t99, cycles90: r.cycles90, cycles99: r.cycles99, curve: r.curve },
    ...(r.t99 === null ? { reason: 'warm-up stopped before 99 % of the steady-state output' } : {}),
  };
}

function compileRequest(version: number, doc: DesignDocument, post: Post): void {
  const t0 = performance.now();
  const compiled = compileDocument(doc);
  const compile = compileView(doc, compiled);
  const compileMs = performance.now() - t0;
  const t1 = performance.now();
  const result = compiled.ok ? estimateFromNetlist(compiled.netlist, compiled.topology) : null;
  const estimateMs = performance.now() - t1;
  post({ type: 'compiled', version, compile, estimate: result ? { result } : null, timings: { compileMs, estimateMs } });
}

function solveRequest(version: number, doc: DesignDocument, warmup: boolean, post: Post): void {
  const t0 = performance.now();
  const prepared = prepareNetlist(doc);
  const compileMs = performance.now() - t0;
  if (!prepared.ok) {
    post({ type: 'cannot-solve', version, reason: `the drawing does not compile: ${prepared.reason}`, timings: { compileMs } });
    return;
  }
  const t1 = performance.now();
  const outputs = prepared.topology.outputs.map((o) => o.node);
  const solved = solveNetlist(prepared.netlist, {
    warmup: false,
    outputNodes: outputs.length > 0 ? outputs : undefined,
    waveformPoints: WAVEFORM_POINTS,
    budgetMs: SOLVE_BUDGET_MS,
  });
  const solveMs = performance.now() - t1;
  if (!solved.ok) {
    post({ type: 'cannot-solve', version, reason: solved.reason, timings: { compileMs, solveMs } });
    return;
  }
  post({ type: 'solved', version, solve: solveView(doc, prepared.compiled, solved), timings: { compileMs, solveMs } });
  if (!warmup) return;
  const t2 = performance.now();
  const w = warmupAfterSolve(prepared.netlist, solved);
  const warmupMs = performance.now() - t2;
  if (w.ok) post({ type: 'warmup', version, warmup: w.warmup, ...(w.reason ? { reason: w.reason } : {}), timings: { warmupMs } });
  else post({ type: 'warmup', version, warmup: null, reason: w.reason, timings: { warmupMs } });
}

/**
 * The priming circuit: a 2-stage full-wave ladder (invented demo values). Solving it runs the
 * same compile, crest-model, shooting and measuring code a real ladder does, so a fresh worker's
 * first real solve does not pay for the JavaScript engine's warm-up (measured in node: the first
 * 10-stage solve of a fresh process takes about twice as long as the next).
 */
export function primeDocument(): DesignDocument {
  return fullWaveStarter(2, { amplitudeV: 2000, frequencyHz: 20e3, capacitanceF: 2.2e-9, loadCurrentA: 5e-5 });
}

function primeRequest(version: number, post: Post): void {
  const t0 = performance.now();
  const prepared = prepareNetlist(primeDocument());
  if (prepared.ok) solveNetlist(prepared.netlist, { warmup: false, waveformPoints: WAVEFORM_POINTS, budgetMs: SOLVE_BUDGET_MS });
  post({ type: 'primed', version, timings: { solveMs: performance.now() - t0 } });
}

/** Validate one incoming message and answer it through `post` (one or more replies). */
export function handleEngineRequest(raw: unknown, post: Post): void {
  const parsed = engineRequestSchema.safeParse(raw);
  if (!parsed.success) {
    const v = raw && typeof raw === 'object' && 'version' in raw && Number.isInteger((raw as { version: unknown }).version) ? ((raw as { version: number }).version) : null;
    post({ type: 'invalid', version: v, reason: firstIssue(parsed.error) });
    return;
  }
  const req = parsed.data;
  if (req.type === 'compile') compileRequest(req.version, req.document, post);
  else if (req.type === 'solve') solveRequest(req.version, req.document, req.warmup, post);
  else primeRequest(req.version, post);
}
