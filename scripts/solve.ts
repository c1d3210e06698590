/**
 * `npm run solve -- FILE [--estimate-only] [--no-warmup]`: solves a SPICE netlist or a design
 * JSON (canvas document) and prints one JSON object (schema in /work/notes/cli-schema.md).
 * Bad input: a message on stderr and exit code 1 (2 when the solve itself fails).
 */
import { readFileSync } from 'node:fs';
import { designDocumentSchema } from '../lib/circuit/document/schema';
import { compileDocument } from '../lib/circuit/compile/compile';
import { recognizeTopology, type TopologyReport } from '../lib/circuit/compile/topology';
import { estimateFromNetlist, type EstimateTopologyView } from '../lib/circuit/estimates/estimate';
import { parseNetlist } from '../lib/circuit/netlist/parse';
import type { Netlist } from '../lib/circuit/netlist/types';
import { solveNetlist } from '../lib/circuit/analysis/solve';

function fail(message: string, code = 1): never {
  process.stderr.write(`solve: ${message}\n`);
  process.exit(code);
}

const args = process.argv.slice(2);
const file = args.find((a) => !a.startsWith('--'));
const estimateOnly = args.includes('--estimate-only');
const warmup = !args.includes('--no-warmup');
if (!file) fail('usage: npm run solve -- FILE [--estimate-only] [--no-warmup]');

let text: string;
try {
  text = readFileSync(file, 'utf8');
} catch (e) {
  fail(`cannot read ${file}: ${(e as Error).message}`);
}

let netlist: Netlist;
let topology: TopologyReport;
const diagnostics: unknown[] = [];
const trimmed = text.trimStart();
if (trimmed.startsWith('{')) {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (e) {
    fail(`${file}: not valid JSON (${(e as Error).message})`);
  }
  const doc = designDocumentSchema.safeParse(json);
  if (!doc.success) fail(`${file}: not a valid design document: ${doc.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`).join('; ')}`);
  const compiled = compileDocument(doc.data);
  if (!compiled.ok) fail(`${file}: ${compiled.reason}\n${JSON.stringify(compiled.diagnostics, null, 2)}`);
  netlist = compiled.netlist;
  topology = compiled.topology;
  diagnostics.push(...compiled.diagnostics);
} else {
  const parsed = parseNetlist(text);
  if (!parsed.ok) fail(`${file}: ${parsed.errors.map((e) => `line ${e.line}: ${e.message}`).join('; ')}`);
  netlist = parsed.netlist;
  diagnostics.push(...parsed.warnings.map((w) => ({ severity: 'warning', ...w })));
  topology = recognizeTopology(netlist);
}

const estimate = estimateFromNetlist(netlist, topology as unknown as EstimateTopologyView);
const stages = topology.ladders.map((l) => l.stages);
const base = { topology: topology.kind, stages, outputs: topology.outputs, estimate };
if (estimateOnly) {
  process.stdout.write(`${JSON.stringify({ ...base, diagnostics }, null, 2)}\n`);
  process.exit(0);
}
const result = solveNetlist(netlist, { warmup, waveformPoints: 0, outputNodes: topology.outputs.length > 0 ? topology.outputs.map((o) => o.node) : undefined });
if (!result.ok) {
  process.stdout.write(`${JSON.stringify({ ...base, error: result.reason, diagnostics: [...diagnostics, ...result.diagnostics] }, null, 2)}\n`);
  fail(result.reason, 2);
}
const nodes = Object.fromEntries(Object.entries(result.nodes).filter(([name]) => !name.includes('#')).map(([name, m]) => [name, { mean: m.mean, min: m.min, max: m.max, ripple: m.ripple }]));
process.stdout.write(
  `${JSON.stringify(
    {
      ...base,
      outputs: base.outputs.length > 0 ? base.outputs : result.outputs,
      nodes,
      parts: result.parts,
      power: result.power,
      energy: result.energy,
      warmup: result.warmup ? { t90: result.warmup.t90, t99: result.warmup.t99, cycles90: result.warmup.cycles90, cycles99: result.warmup.cycles99 } : null,
      checks: result.checks,
      diagnostics: [...diagnostics, ...result.diagnostics],
      stats: result.stats,
    },
    null,
    2,
  )}\n`,
);
