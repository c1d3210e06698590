/**
 * `npm run solve -- FILE [--estimate-only] [--no-warmup] [--waveforms]`
 *
 * FILE is a SPICE-subset netlist or a design JSON (a canvas document). Prints ONE JSON object on
 * stdout (schema in the README, "Command line"); problems with the file go to stderr with a
 * non-zero exit: 2 usage, 3 unreadable or invalid file, 4 the circuit cannot be solved.
 */
import fs from 'node:fs';
import {
  compileDocument,
  designDocumentSchema,
  estimateFromNetlist,
  parseNetlist,
  recognizeTopology,
  type Diagnostic,
  type Netlist,
  type ParseIssue,
  type TopologyReport,
} from '../lib/circuit';
import { solveNetlist } from '../lib/circuit/analysis/solve';

/** Largest input file read (bytes); matches the parser's own limit. */
const MAX_FILE_BYTES = 2_000_000;

function fail(code: number, message: string): never {
  process.stderr.write(`solve: ${message}\n`);
  process.exit(code);
}

const args = process.argv.slice(2);
const flags = new Set(args.filter((a) => a.startsWith('--')));
const files = args.filter((a) => !a.startsWith('--'));
const known = new Set(['--estimate-only', '--no-warmup', '--waveforms']);
for (const f of flags) if (!known.has(f)) fail(2, `unknown option ${f} (known: ${[...known].join(', ')})`);
if (files.length !== 1) fail(2, 'usage: npm run solve -- FILE [--estimate-only] [--no-warmup] [--waveforms]');
const file = files[0];

let text: string;
try {
  const stat = fs.statSync(file);
  if (!stat.isFile()) fail(3, `${file} is not a file`);
  if (stat.size > MAX_FILE_BYTES) fail(3, `${file} is ${stat.size} bytes; the limit is ${MAX_FILE_BYTES}`);
  text = fs.readFileSync(file, 'utf8');
} catch (e) {
  fail(3, `cannot read ${file}: ${e instanceof Error ? e.message : String(e)}`);
}

const t0 = performance.now();
let netlist: Netlist;
let topology: TopologyReport;
const diagnostics: Diagnostic[] = [];
/** Netlist cards the parser kept but does not act on (e.g. `.tran`), by line. */
const parseWarnings: ParseIssue[] = [];
const looksJson = /\.json$/i.test(file) || /^\s*[{[]/.test(text);
if (looksJson) {
  let raw: unknown;
  try {
    raw = JSON.parse(text);
  } catch (e) {
    fail(3, `${file}: not valid JSON (${e instanceof Error ? e.message : String(e)})`);
  }
  // A saved design export may wrap the document; accept the bare document or { document }.
  const candidate = raw && typeof raw === 'object' && 'document' in raw ? (raw as { document: unknown }).document : raw;
  const doc = designDocumentSchema.safeParse(candidate);
  if (!doc.success) {
    const issue = doc.error.issues[0];
    fail(3, `${file}: not a Kilorung design document: ${issue.path.join('.') || '(root)'}: ${issue.message}`);
  }
  const compiled = compileDocument(doc.data);
  if (!compiled.ok) {
    const lines = compiled.diagnostics.filter((d) => d.severity === 'error').map((d) => `  ${d.code}: ${d.message}`);
    fail(3, `${file}: the design does not compile: ${compiled.reason}\n${lines.join('\n')}`);
  }
  netlist = compiled.netlist;
  topology = compiled.topology;
  diagnostics.push(...compiled.diagnostics);
} else {
  const parsed = parseNetlist(text);
  if (!parsed.ok) fail(3, parsed.errors.map((e) => `${file}:${e.line}: ${e.message}`).join('\n'));
  netlist = parsed.netlist;
  parseWarnings.push(...parsed.warnings);
  topology = recognizeTopology(netlist);
  diagnostics.push(...topology.diagnostics);
}
const compileMs = performance.now() - t0;

const t1 = performance.now();
const estimate = estimateFromNetlist(netlist, topology);
const estimateMs = performance.now() - t1;

const base = {
  file,
  title: netlist.title,
  topology: topology.kind,
  stages: topology.ladders.map((l) => l.stages),
  outputs: topology.outputs,
  estimate,
  parseWarnings,
};

if (flags.has('--estimate-only')) {
  process.stdout.write(`${JSON.stringify({ ...base, diagnostics, stats: { compileMs, estimateMs } }, null, 2)}\n`);
  process.exit(0);
}

const result = solveNetlist(netlist, {
  warmup: !flags.has('--no-warmup'),
  outputNodes: topology.outputs.length ? topology.outputs.map((o) => o.node) : undefined,
  waveformPoints: flags.has('--waveforms') ? 200 : 0,
});
if (!result.ok) {
  process.stdout.write(`${JSON.stringify({ ...base, ok: false, reason: result.reason, diagnostics: [...diagnostics, ...result.diagnostics], stats: result.stats ?? {} }, null, 2)}\n`);
  fail(4, `cannot solve: ${result.reason}`);
}

const nodes = Object.fromEntries(
  Object.entries(result.nodes).map(([name, m]) => [name, { mean: m.mean, min: m.min, max: m.max, ripple: m.ripple, ...(m.waveform ? { waveform: m.waveform } : {}) }]),
);
const output = {
  ...base,
  ok: true,
  outputs: result.outputs.map((o) => ({ ...o, mean: result.nodes[o.node]?.mean ?? null, ripple: result.nodes[o.node]?.ripple ?? null })),
  frequencyHz: result.frequencyHz,
  nodes,
  parts: result.parts,
  power: result.power,
  energy: result.energy,
  warmup: result.warmup ? { t90: result.warmup.t90, t99: result.warmup.t99, cycles90: result.warmup.cycles90, cycles99: result.warmup.cycles99 } : null,
  checks: result.checks,
  safety: result.safety,
  diagnostics: [...diagnostics, ...result.diagnostics],
  stats: { ...result.stats, compileMs, estimateMs },
};
process.stdout.write(`${JSON.stringify(output, null, 2)}\n`);
