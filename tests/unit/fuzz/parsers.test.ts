/**
 * Fuzz-style checks of the two text/JSON doors into the engine: the netlist parser and the
 * design document validator (plus what runs right behind them: engineering-unit numbers,
 * compiling a valid document, laying a parsed netlist out as blocks). Seeded and repeatable
 * (tests/unit/fuzz/hostile.ts). Every call must return a value or a typed failure — never throw,
 * never hang (a wall-clock bound per call), never let a non-finite number through as valid.
 */
import { describe, expect, it } from 'vitest';
import { MAX_ELEMENTS, MAX_LOGICAL_LINE_CHARS, MAX_NETLIST_CHARS, parseNetlist, type ParseResult } from '@/lib/circuit/netlist/parse';
import { parseEngineering } from '@/lib/circuit/netlist/units';
import { designDocumentSchema, MAX_BLOCKS } from '@/lib/circuit/document/schema';
import { fullWaveStarter, halfWaveStarter } from '@/lib/circuit/document/starters';
import { compileDocument } from '@/lib/circuit/compile/compile';
import { documentFromNetlist } from '@/lib/circuit/document/from-netlist';
import { deepJsonText, FUZZ_SEED, int, mutate, NASTY_NUMBERS, NASTY_STRINGS, pick, randomBytes, randomText, randomValue, rng, timed } from './hostile';

const ROUNDS = Number(process.env.FUZZ_ROUNDS ?? 400);

/** Every number reachable from `v` is finite (NaN/Infinity must never pass as valid). */
function allFinite(v: unknown, path = '$'): string | null {
  if (typeof v === 'number') return Number.isFinite(v) ? null : path;
  if (Array.isArray(v)) {
    for (let i = 0; i < v.length; i++) {
      const bad = allFinite(v[i], `${path}[${i}]`);
      if (bad) return bad;
    }
  } else if (v && typeof v === 'object') {
    for (const [k, x] of Object.entries(v)) {
      const bad = allFinite(x, `${path}.${k}`);
      if (bad) return bad;
    }
  }
  return null;
}

function checkParse(name: string, text: string, budgetMs = 3000): ParseResult {
  const { value } = timed(name, budgetMs, () => parseNetlist(text));
  expect(typeof value.ok).toBe('boolean');
  if (value.ok) {
    expect(allFinite(value.netlist), `${name}: non-finite number in a parsed netlist`).toBeNull();
    // what the app does next with a parsed netlist must not throw either
    timed(`${name} → documentFromNetlist`, budgetMs, () => documentFromNetlist(value.netlist));
  } else {
    expect(value.errors.length).toBeGreaterThan(0);
    for (const e of value.errors) {
      expect(typeof e.message).toBe('string');
      expect(Number.isInteger(e.line)).toBe(true);
    }
  }
  return value;
}

const CARD_LETTERS = ['R', 'C', 'D', 'V', 'I', 'L', 'Q', 'X', '.', '+', '*', ';', '$', ' '];

function randomCard(r: ReturnType<typeof rng>): string {
  const letter = pick(r, CARD_LETTERS);
  const parts = [`${letter}${int(r, 0, 99)}`];
  for (let i = int(r, 0, 6); i > 0; i--) {
    const k = r();
    parts.push(k < 0.3 ? String(pick(r, NASTY_NUMBERS)) : k < 0.6 ? pick(r, NASTY_STRINGS) : k < 0.8 ? `${int(r, -5, 5)}${pick(r, ['', 'k', 'meg', 'u', 'n', 'p', 'f', 'mil', 'e999', 'x'])}` : randomText(r, int(r, 1, 8)));
  }
  if (r() < 0.1) parts.push(pick(r, ['IC=', 'IC=1e999', 'SIN(0 1e999 NaN)', 'PULSE(', 'D(IS=1e-14 N=', '.model', 'AC 1']));
  return parts.join(pick(r, [' ', '  ', '\t', ',', ' = ']));
}

describe(`netlist parser under hostile input (seed ${FUZZ_SEED})`, () => {
  it('random card soup: always a result or typed errors', () => {
    const r = rng(FUZZ_SEED);
    for (let i = 0; i < ROUNDS; i++) {
      const lines = Array.from({ length: int(r, 0, 30) }, () => randomCard(r));
      checkParse(`soup #${i}`, ['title', ...lines, r() < 0.5 ? '.end' : ''].join(pick(r, ['\n', '\r\n', '\r'])));
    }
  });

  it('mutated valid ladders: numbers like 1e999, NaN, -0, Infinity in every field', () => {
    const r = rng(FUZZ_SEED + 1);
    const base = ['* ladder', 'V1 in 0 SIN(0 1000 50k)', 'C1 in n1 10n', 'D1 0 n1 DX', 'D2 n1 out DX', 'C2 out 0 10n', 'RL out 0 10meg', '.model DX D(IS=1e-14 N=1.8 RS=10 BV=5k)', '.end'];
    let accepted = 0;
    for (let i = 0; i < ROUNDS; i++) {
      const lines = [...base];
      const at = int(r, 1, lines.length - 2);
      const tokens = lines[at].split(' ');
      tokens[int(r, 1, tokens.length - 1)] = pick(r, ['1e999', '-1e999', 'NaN', 'Infinity', '-0', '1e-400', '0', '-1', '1e308k', '9'.repeat(400), '0x10', '', '\u0000', '１０n']);
      lines[at] = tokens.join(' ');
      if (checkParse(`mutated #${i}: ${lines[at]}`, lines.join('\n')).ok) accepted++;
    }
    expect(accepted).toBeGreaterThan(0); // the mutations are not all rejected for one trivial reason
  });

  it('random bytes and random unicode text', () => {
    const r = rng(FUZZ_SEED + 2);
    for (let i = 0; i < 60; i++) {
      checkParse(`bytes #${i}`, new TextDecoder().decode(randomBytes(r, int(r, 1, 4000))));
      checkParse(`unicode #${i}`, randomText(r, int(r, 1, 4000)));
    }
  });

  it('limits: a 1 MB card, more than the character limit, more elements than allowed, endless continuations', () => {
    const longCard = checkParse('1 MB card', `title\nR1 a b ${'9'.repeat(1_000_000)}\n.end`);
    expect(longCard.ok).toBe(false);
    expect(MAX_LOGICAL_LINE_CHARS).toBeLessThan(1_000_000);
    const tooLong = checkParse('over MAX_NETLIST_CHARS', `title\n${'*'.repeat(MAX_NETLIST_CHARS + 10)}`);
    expect(tooLong.ok).toBe(false);
    const many = Array.from({ length: MAX_ELEMENTS + 5 }, (_, i) => `R${i} a 0 1`).join('\n');
    if (many.length <= MAX_NETLIST_CHARS) expect(checkParse('too many elements', `title\n${many}`, 10_000).ok).toBe(false);
    else checkParse('too many elements (over the character limit)', `title\n${many}`, 10_000);
    const plus = checkParse('continuation flood', `title\nR1 a b\n${'+ 1\n'.repeat(50_000)}`);
    expect(plus.ok).toBe(false);
    checkParse('only newlines', '\n'.repeat(1_500_000));
    checkParse('control characters', `title\nR1 a\u0000 b 1k\u0007\nC1 \u001b[31m 0 1n\n`);
  });
});

function validate(name: string, input: unknown, budgetMs = 3000) {
  const { value } = timed(name, budgetMs, () => designDocumentSchema.safeParse(input));
  if (value.success) {
    expect(allFinite(value.data), `${name}: non-finite number accepted`).toBeNull();
    expect(value.data.blocks.length).toBeLessThanOrEqual(MAX_BLOCKS);
    // a valid document must compile to a result (diagnostics, never an exception)
    timed(`${name} → compileDocument`, budgetMs, () => compileDocument(value.data));
  } else {
    expect(value.error.issues.length).toBeGreaterThan(0);
    expect(typeof value.error.issues[0].message).toBe('string');
  }
  return value;
}

describe(`design document validator under hostile input (seed ${FUZZ_SEED})`, () => {
  const starter = halfWaveStarter(3, { amplitudeV: 2000, frequencyHz: 20_000, capacitanceF: 10e-9, loadCurrentA: 1e-4 });
  const full = fullWaveStarter(2, { amplitudeV: 5000, frequencyHz: 40_000, capacitanceF: 4.7e-9, loadCurrentA: 1e-4 });

  it('the starters are valid (the mutations start from something real)', () => {
    expect(validate('half-wave starter', starter).success).toBe(true);
    expect(validate('full-wave starter', full).success).toBe(true);
  });

  it('one hostile leaf in a valid document: typed failure or a valid, finite document', () => {
    const r = rng(FUZZ_SEED + 3);
    let accepted = 0;
    for (let i = 0; i < ROUNDS; i++) if (validate(`mutation #${i}`, mutate(r, r() < 0.5 ? starter : full)).success) accepted++;
    expect(accepted).toBeLessThan(ROUNDS);
  });

  it('NaN, Infinity, -0 and "1e999" where numbers go', () => {
    for (const bad of [Number.NaN, Infinity, -Infinity, '1e999', 'NaN', Number.parseFloat('1e999')]) {
      const doc = structuredClone(starter) as unknown as { blocks: { data: Record<string, unknown> }[] };
      const source = doc.blocks.find((b) => 'amplitudeV' in b.data)!;
      source.data.amplitudeV = bad;
      expect(validate(`amplitude ${String(bad)}`, doc).success).toBe(false);
    }
    const doc = structuredClone(starter) as unknown as { blocks: { position: { x: number } }[] };
    doc.blocks[0].position.x = -0;
    expect(validate('negative zero position', doc).success).toBe(true);
  });

  it('random values, deep nesting (10 000 levels), 100 000 stages, a 1 MB label, unicode ids', () => {
    const r = rng(FUZZ_SEED + 4);
    for (let i = 0; i < ROUNDS; i++) validate(`random #${i}`, randomValue(r));
    for (const kind of ['array', 'object'] as const) {
      const deep = JSON.parse(deepJsonText(10_000, kind)) as unknown;
      validate(`deep ${kind}`, deep);
      validate(`deep ${kind} as blocks`, { schemaVersion: 1, blocks: deep, wires: [], settings: {} });
      validate(`deep ${kind} as data`, { ...starter, blocks: [{ ...starter.blocks[0], data: deep }] });
    }
    const stage = starter.blocks.find((b) => b.kind === 'stage')!;
    const huge = { ...starter, blocks: Array.from({ length: 100_000 }, (_, i) => ({ ...stage, id: `s${i}` })) };
    const { ms } = timed('100 000 stages', 10_000, () => expect(validate('100 000 stages', huge, 10_000).success).toBe(false));
    expect(ms).toBeLessThan(10_000);
    const atLimit = { ...starter, blocks: Array.from({ length: MAX_BLOCKS + 1 }, (_, i) => ({ ...stage, id: `s${i}` })), wires: [] };
    expect(validate('MAX_BLOCKS + 1', atLimit).success).toBe(false);
    expect(validate('1 MB label', { ...starter, blocks: [{ ...starter.blocks[0], label: 'x'.repeat(1_000_000) }, ...starter.blocks.slice(1)] }).success).toBe(false);
    expect(validate('unicode id', { ...starter, blocks: [{ ...starter.blocks[0], id: 'Ω1🔥' }, ...starter.blocks.slice(1)] }).success).toBe(false);
    expect(validate('proto key', JSON.parse(`{"__proto__":{"polluted":1},"schemaVersion":1,"blocks":[],"wires":[]}`)).success).toBe(true);
    expect(({} as Record<string, unknown>).polluted).toBeUndefined();
  });
});

describe(`engineering numbers (seed ${FUZZ_SEED})`, () => {
  it('parseEngineering returns a finite number or null, never NaN/Infinity', () => {
    const r = rng(FUZZ_SEED + 5);
    const inputs = [...NASTY_STRINGS, '1e999', '1e308meg', '-1e308meg', '1e-400', '9'.repeat(400), '1.2.3k', 'k', '.', '-', '+', 'e5', '1e', '1e+', '10uF', '4k7'];
    for (let i = 0; i < ROUNDS; i++) inputs.push(`${pick(r, ['', '-', '+'])}${String(pick(r, NASTY_NUMBERS))}${pick(r, ['', 'k', 'meg', 'mil', 'u', 'F', 'e300'])}`, randomText(r, int(r, 0, 12)));
    for (const s of inputs) {
      const { value } = timed(`parseEngineering(${JSON.stringify(s).slice(0, 40)})`, 200, () => parseEngineering(s));
      if (value !== null) expect(Number.isFinite(value), `parseEngineering(${JSON.stringify(s)}) = ${value}`).toBe(true);
    }
  });
});
