/**
 * The inspector's field rules and edits: every value a form can commit yields a block that
 * designBlockSchema accepts, and every refused entry is refused with the reason the field shows.
 */
import { describe, expect, it } from 'vitest';
import { designBlockSchema, designSettingsSchema, fullWaveStarter, halfWaveStarter, symmetricStarter, type DesignBlock } from '@/lib/circuit';
import {
  AC_SOURCE_FIELDS,
  CAPACITOR_FIELDS,
  DC_SOURCE_FIELDS,
  DIODE_FIELDS,
  LOAD_FIELDS,
  LOAD_MODE_START,
  REASON_ABOVE_ONE,
  REASON_NEGATIVE,
  REASON_NOT_POSITIVE,
  RESISTOR_FIELDS,
  SETTINGS_FIELDS,
  decideCommit,
  drivePeakV,
  getNumberAt,
  readField,
  readLabel,
  ruleReason,
  setAmplitudeMode,
  setAt,
  setLoadMode,
  setStageVariant,
  updateSettings,
  withLabel,
  withPartId,
  type FieldSpec,
} from '@/lib/editor/fields';
import { REASON_NOT_A_NUMBER, REASON_SUFFIX } from '@/lib/editor/format';

const starter = halfWaveStarter(3, { amplitudeV: 10e3, frequencyHz: 40e3, capacitanceF: 2.2e-9, capacitorRatedV: 25e3, loadCurrentA: 1e-3 });
const full = fullWaveStarter(2, { amplitudeV: 5e3, frequencyHz: 20e3, capacitanceF: 1e-9, loadResistanceOhm: 100e6 });
const sym = symmetricStarter(2, { amplitudeV: 5e3, frequencyHz: 20e3, capacitanceF: 1e-9 });
const allBlocks: DesignBlock[] = [...starter.blocks, ...full.blocks, ...sym.blocks];

function first<K extends DesignBlock['kind']>(kind: K, blocks = allBlocks): Extract<DesignBlock, { kind: K }> {
  const b = blocks.find((x) => x.kind === kind);
  if (!b) throw new Error(`no ${kind} block in the starters`);
  return b as Extract<DesignBlock, { kind: K }>;
}

function valid(block: DesignBlock): boolean {
  return designBlockSchema.safeParse(block).success;
}

/** Text that satisfies `spec` (in its display scale), and text that breaks its rule. */
function goodText(spec: FieldSpec): string {
  return spec.scale === 100 ? '50' : `4.7k${spec.unit === 'F' ? 'F' : ''}`;
}

describe('ruleReason', () => {
  it('mirrors the schema rules', () => {
    expect(ruleReason(1, 'positive')).toBeNull();
    expect(ruleReason(0, 'positive')).toBe(REASON_NOT_POSITIVE);
    expect(ruleReason(-1, 'positive')).toBe(REASON_NOT_POSITIVE);
    expect(ruleReason(0, 'nonNegative')).toBeNull();
    expect(ruleReason(-1e-12, 'nonNegative')).toBe(REASON_NEGATIVE);
    expect(ruleReason(-5, 'finite')).toBeNull();
    expect(ruleReason(1, 'fraction')).toBeNull();
    expect(ruleReason(1.01, 'fraction')).toBe(REASON_ABOVE_ONE);
    expect(ruleReason(0, 'fraction')).toBe(REASON_NOT_POSITIVE);
    expect(ruleReason(Infinity, 'finite')).not.toBeNull();
  });
});

describe('readField', () => {
  const cap = CAPACITOR_FIELDS[0];
  it('reads engineering notation in the field unit', () => {
    expect(readField('4.7n', cap)).toEqual({ ok: true, value: 4.7e-9 });
    expect(readField('4.7nF', cap)).toEqual({ ok: true, value: 4.7e-9 });
  });
  it('flags a bad entry with its reason', () => {
    expect(readField('four', cap)).toEqual({ ok: false, reason: REASON_NOT_A_NUMBER });
    expect(readField('0', cap)).toEqual({ ok: false, reason: REASON_NOT_POSITIVE });
    expect(readField('-1n', cap)).toEqual({ ok: false, reason: REASON_NOT_POSITIVE });
    const r = readField('4.7q', cap);
    expect(r.ok).toBe(false);
    if (!r.ok) expect(r.reason).toContain(REASON_SUFFIX);
    expect(readField('', cap).ok).toBe(false);
  });
  it('reads an empty optional field as "clear it"', () => {
    expect(readField('  ', CAPACITOR_FIELDS[1])).toEqual({ ok: true, value: undefined });
  });
  it('undoes the percent scale and checks the result', () => {
    const derating = SETTINGS_FIELDS.find((f) => f.path[0] === 'deratingFraction')!;
    expect(readField('80', derating)).toEqual({ ok: true, value: 0.8 });
    expect(readField('80 %', derating)).toEqual({ ok: true, value: 0.8 });
    expect(readField('120', derating)).toEqual({ ok: false, reason: REASON_ABOVE_ONE });
    const tol = CAPACITOR_FIELDS.find((f) => f.path[0] === 'tolerance')!;
    expect(readField('10', tol)).toEqual({ ok: true, value: 0.1 });
  });
});

describe('setAt', () => {
  it('copies the path and shares the rest', () => {
    const obj = { a: { b: 1, c: { d: 2 } }, e: { f: 3 } };
    const next = setAt(obj, ['a', 'b'], 5);
    expect(next).toEqual({ a: { b: 5, c: { d: 2 } }, e: { f: 3 } });
    expect(obj.a.b).toBe(1);
    expect(next.e).toBe(obj.e);
    expect(next.a.c).toBe(obj.a.c);
  });
  it('creates missing objects and drops emptied ones', () => {
    const s = { strayCapacitanceF: 0, deratingFraction: 0.8 };
    const withReq = setAt(s, ['requirement', 'outputV'], 30e3);
    expect(withReq).toEqual({ ...s, requirement: { outputV: 30e3 } });
    expect(setAt(withReq, ['requirement', 'outputV'], undefined)).toEqual(s);
    expect(setAt(s, ['requirement', 'outputV'], undefined)).toBe(s);
    expect(getNumberAt(withReq, ['requirement', 'outputV'])).toBe(30e3);
    expect(getNumberAt(withReq, ['requirement', 'missing'])).toBeUndefined();
  });
});

/** Every field of `specs` inside `block.data` at `base`, set to a good value and (if optional) cleared. */
function exerciseFields(block: DesignBlock, specs: readonly FieldSpec[], base: string[] = []) {
  for (const spec of specs) {
    const r = readField(goodText(spec), spec);
    expect(r.ok, `${spec.label} accepts ${goodText(spec)}`).toBe(true);
    if (!r.ok) continue;
    const set = setAt(block, ['data', ...base, ...spec.path], r.value);
    expect(valid(set), `${block.kind} with ${spec.label} = ${r.value}`).toBe(true);
    expect(getNumberAt(set, ['data', ...base, ...spec.path])).toBe(r.value);
    if (spec.optional) {
      const cleared = setAt(set, ['data', ...base, ...spec.path], undefined);
      expect(valid(cleared), `${block.kind} with ${spec.label} cleared`).toBe(true);
      expect(getNumberAt(cleared, ['data', ...base, ...spec.path])).toBeUndefined();
    }
    // What the rule refuses would also be refused by the schema: the form is never looser.
    const bad = spec.rule === 'finite' ? null : spec.rule === 'nonNegative' ? -1 : 0;
    if (bad !== null) {
      expect(readField(String(bad), spec).ok, `${spec.label} refuses ${bad}`).toBe(false);
      expect(valid(setAt(block, ['data', ...base, ...spec.path], bad / (spec.scale ?? 1)))).toBe(false);
    }
  }
}

describe('block edits pass designBlockSchema', () => {
  it('covers every field of every block kind the starters hold', () => {
    exerciseFields(first('acSource'), AC_SOURCE_FIELDS);
    const stage = first('stage');
    for (const role of ['pumpC', 'smoothC'] as const) exerciseFields(stage, CAPACITOR_FIELDS, [role]);
    for (const role of ['diodeA', 'diodeB'] as const) exerciseFields(stage, DIODE_FIELDS, [role]);
    const fullStage = first('stage', full.blocks);
    exerciseFields(fullStage, CAPACITOR_FIELDS, ['pump2C']);
    for (const role of ['diodeC', 'diodeD'] as const) exerciseFields(fullStage, DIODE_FIELDS, [role]);
    exerciseFields(first('load', starter.blocks), [LOAD_FIELDS.current]);
    exerciseFields(first('load', full.blocks), [LOAD_FIELDS.resistor]);
  });

  it('covers the single parts and the DC source', () => {
    const at = { x: 0, y: 0 };
    const diode = first('stage').data.diodeA;
    const blocks: DesignBlock[] = [
      { id: 'c1', kind: 'capacitor', position: at, data: { capacitanceF: 1e-9 } },
      { id: 'd1', kind: 'diode', position: at, data: diode },
      { id: 'r1', kind: 'resistor', position: at, data: { resistanceOhm: 1e6 } },
      { id: 'v1', kind: 'dcSource', position: at, data: { voltageV: 100, sourceResistanceOhm: 0 } },
    ];
    blocks.forEach((b) => expect(valid(b)).toBe(true));
    exerciseFields(blocks[0], CAPACITOR_FIELDS);
    exerciseFields(blocks[1], DIODE_FIELDS);
    exerciseFields(blocks[2], RESISTOR_FIELDS);
    exerciseFields(blocks[3], DC_SOURCE_FIELDS);
  });

  it('switches a stage between half-wave and full-wave', () => {
    const half = first('stage');
    const f = setStageVariant(half, 'full');
    expect(valid(f)).toBe(true);
    expect(f.data.variant).toBe('full');
    expect(f.data.pump2C).toEqual(half.data.pumpC);
    expect(f.data.diodeC).toEqual(half.data.diodeA);
    expect(f.data.diodeD).toEqual(half.data.diodeB);
    const back = setStageVariant(f, 'half');
    expect(valid(back)).toBe(true);
    expect(back.data).toEqual(half.data);
    expect(setStageVariant(half, 'half')).toBe(half);
  });

  it('switches a load between resistor and constant current, starting from (almost) no load', () => {
    const load = first('load', starter.blocks);
    expect(load.data.mode).toBe('current');
    const r = setLoadMode(load, 'resistor');
    expect(valid(r)).toBe(true);
    expect(r.data).toEqual({ mode: 'resistor', resistanceOhm: LOAD_MODE_START.resistanceOhm });
    const c = setLoadMode(r, 'current');
    expect(valid(c)).toBe(true);
    expect(c.data).toEqual({ mode: 'current', currentA: 0 });
  });

  it('keeps the drive when the amplitude changes from peak to RMS (sine: peak = √2 · RMS, common practice)', () => {
    const src = first('acSource');
    const peak = drivePeakV(src.data);
    const rms = setAmplitudeMode(src, src.data.amplitudeMode === 'peak' ? 'rms' : 'peak');
    expect(valid(rms)).toBe(true);
    expect(drivePeakV(rms.data)).toBeCloseTo(peak, 9);
    // 230 V RMS mains is 325.3 V peak.
    const mains = { ...src, data: { ...src.data, amplitudeMode: 'rms' as const, amplitudeV: 230 } };
    expect(drivePeakV(mains.data)).toBeCloseTo(325.27, 2);
    expect(setAmplitudeMode(mains, 'peak').data.amplitudeV).toBeCloseTo(325.27, 2);
  });

  it('refuses a label past the schema limit', () => {
    expect(readLabel('  Stage 4 ')).toEqual({ ok: true, value: 'Stage 4' });
    expect(readLabel('   ')).toEqual({ ok: true, value: undefined });
    expect(readLabel('x'.repeat(81)).ok).toBe(false);
    const b = first('stage');
    expect(valid({ ...b, label: 'x'.repeat(80) })).toBe(true);
  });
});

describe('settings edits pass designSettingsSchema', () => {
  it('sets and clears every settings field', () => {
    let s = starter.settings;
    for (const spec of SETTINGS_FIELDS) {
      const r = readField(goodText(spec), spec);
      expect(r.ok, spec.label).toBe(true);
      if (!r.ok) continue;
      s = updateSettings(s, spec.path, r.value);
      expect(designSettingsSchema.safeParse(s).success, spec.label).toBe(true);
      if (spec.optional) {
        const cleared = updateSettings(s, spec.path, undefined);
        expect(designSettingsSchema.safeParse(cleared).success, `${spec.label} cleared`).toBe(true);
      }
    }
    expect(s.requirement).toEqual({ outputV: 4.7e3, loadCurrentA: 4.7e3, maxRippleFraction: 0.5 });
    expect(updateSettings(s, ['deratingFraction'], s.deratingFraction)).toBe(s);
  });
});

describe('decideCommit (what a field passes on at blur or Enter)', () => {
  const cap = CAPACITOR_FIELDS[0];
  const rated = CAPACITOR_FIELDS[1];
  it('passes a changed valid value on', () => {
    expect(decideCommit('4.7n', '10n', 10e-9, cap)).toEqual({ kind: 'commit', value: 4.7e-9 });
    expect(decideCommit('', '25k', 25e3, rated)).toEqual({ kind: 'commit', value: undefined });
  });
  it('never passes a refused entry on', () => {
    expect(decideCommit('4.7x', '10n', 10e-9, cap)).toMatchObject({ kind: 'refuse' });
    expect(decideCommit('-1n', '10n', 10e-9, cap)).toEqual({ kind: 'refuse', reason: REASON_NOT_POSITIVE });
    expect(decideCommit('', '10n', 10e-9, cap)).toMatchObject({ kind: 'refuse' });
    expect(decideCommit('12k', '10k', 10e3, rated, (v) => (v > 11e3 ? 'above the part’s 11 kV' : null))).toEqual({ kind: 'refuse', reason: 'above the part’s 11 kV' });
  });
  it('does not round a value the field shows with fewer digits, nor commit the same value', () => {
    // 123456.7 V is shown as 123.457k: tabbing through must leave it as it is.
    expect(decideCommit('123.457k', '123.457k', 123456.7, rated)).toEqual({ kind: 'unchanged' });
    expect(decideCommit('10nF', '10n', 10e-9, cap)).toEqual({ kind: 'unchanged' });
    expect(decideCommit('', '', undefined, rated)).toEqual({ kind: 'unchanged' });
  });
});

describe('label and part reference edits', () => {
  it('set and remove without leaving empty keys, and stay valid', () => {
    const b = first('stage');
    const named = withLabel(b, 'Top stage');
    expect(named.label).toBe('Top stage');
    expect(valid(named)).toBe(true);
    const unnamed = withLabel(named, undefined);
    expect('label' in unnamed).toBe(false);
    expect(valid(unnamed)).toBe(true);
    const spec = withPartId(b.data.pumpC, 'TG-HVC-2n2');
    expect(spec.partId).toBe('TG-HVC-2n2');
    const block = setAt(b, ['data', 'pumpC'], spec);
    expect(valid(block)).toBe(true);
    expect('partId' in withPartId(spec, undefined)).toBe(false);
  });
});
