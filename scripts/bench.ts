/**
 * `npm run bench [-- --quick]`: this engine's periodic steady state against ngspice's brute
 * transient to the same steady state (from the ideal no-load charge state, N = 12·n² + 40
 * periods at 400 points per period, N doubled until the last two periods' output means agree
 * to 1e-5), on generated half-wave ladders; then a cost-vs-n table with a fitted exponent.
 */
import { generateLadder, GENERIC_RECTIFIER, type LadderOptions } from '../lib/circuit/netlist/generate';
import { solveNetlist } from '../lib/circuit/analysis/solve';
import { ensureNgspice, ngspiceSteadyState } from '../tests/fixtures/ngspice';

const quick = process.argv.includes('--quick');
if (!ensureNgspice()) {
  process.stderr.write('bench: ngspice is not available and could not be installed\n');
  process.exit(1);
}
const ladder = (n: number, f: number): LadderOptions => ({ kind: 'half-wave', stages: n, peakV: 1000, frequencyHz: f, capacitanceF: (10e-6 * 50) / f, diode: GENERIC_RECTIFIER, loadCurrentA: 1e-3, sourceResistanceOhm: 0.1 });

console.log('engine vs ngspice, half-wave, 1 kV peak, C·f = 5e-4 F·Hz, 1 mA, Rs 0.1 Ω');
console.log('n    f(Hz)  ours(ms) ngspice(ms) ratio  Δmean(%)  Δripple(%) ngspice periods settle');
for (const n of quick ? [2, 4] : [2, 4, 8]) {
  const f = 50;
  const nl = generateLadder(ladder(n, f));
  const ours = solveNetlist(nl, { waveformPoints: 0 });
  if (!ours.ok) {
    console.log(n, f, 'engine failed:', ours.reason);
    continue;
  }
  const out = `s${n}`;
  const ng = ngspiceSteadyState(nl, { frequencyHz: f, nodes: [out], outputNode: out, periods: 12 * n * n + 40, settleTol: 1e-5, maxPeriods: 4000, stepsPerPeriod: 400 });
  const dm = (100 * (ours.nodes[out].mean - ng.nodes[out].mean)) / ng.nodes[out].mean;
  const dr = (100 * (ours.nodes[out].ripple - ng.nodes[out].ripple)) / ng.nodes[out].ripple;
  console.log(
    [n, f, ours.stats.solveMs.toFixed(0), ng.wallMs.toFixed(0), (ng.wallMs / ours.stats.solveMs).toFixed(1), dm.toFixed(4), dr.toFixed(2), ng.periods, ng.settle.toExponential(1)].map(String).map((s) => s.padEnd(8)).join(' '),
  );
}

console.log('\ncost vs n (engine only, 40 kHz, same load)');
const xs: number[] = [];
const ys: number[] = [];
for (const n of quick ? [2, 4, 8] : [2, 4, 8, 12, 20]) {
  const r = solveNetlist(generateLadder(ladder(n, 40_000)), { waveformPoints: 0, budgetMs: 60_000 });
  if (!r.ok) {
    console.log(n, 'failed:', r.reason);
    continue;
  }
  console.log(`n=${n}  ${r.stats.solveMs.toFixed(0)} ms  shooting iterations ${r.stats.shootingIterations}  periods ${r.stats.periodsIntegrated}`);
  xs.push(Math.log(n));
  ys.push(Math.log(r.stats.solveMs));
}
const mx = xs.reduce((a, b) => a + b, 0) / xs.length;
const my = ys.reduce((a, b) => a + b, 0) / ys.length;
const slope = xs.reduce((a, x, i) => a + (x - mx) * (ys[i] - my), 0) / xs.reduce((a, x) => a + (x - mx) ** 2, 0);
console.log(`fitted cost exponent (least squares on log t vs log n): ${slope.toFixed(2)}`);
