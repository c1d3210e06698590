/**
 * The canvas document: the versioned JSON a design revision stores (one JSONB row per revision).
 * It is what the editor draws and what `compile/` turns into a netlist. Values are SI numbers;
 * engineering notation exists only at the UI edge.
 *
 * Ports (the `port` names edges connect), per block kind:
 * - `acSource`  single: `hot`, `ret` · centreTapped: `hot`, `ct`, `hotB` (hot and hotB in antiphase about ct)
 * - `dcSource`  `pos`, `neg`
 * - `stage`     half: `xIn`, `yIn`, `xOut`, `yOut` · full: also `x2In`, `x2Out`
 *               (x = driven/pumping column, x2 = the antiphase driven column, y = smoothing column)
 * - `load`      `a`, `b` (current drawn from a, returned at b)
 * - `ground`    `g`
 * - `capacitor` `a`, `b` · `resistor` `a`, `b` · `diode` `anode`, `cathode`
 *
 * Half-wave stage k (positive polarity) holds: pumping C from xIn to xOut, smoothing C from yIn
 * to yOut, diode A from yIn (anode) to xOut (cathode), diode B from xOut (anode) to yOut
 * (cathode). Negative polarity reverses both diodes. A full-wave stage adds a second pumping C
 * from x2In to x2Out, diode C from yIn to x2Out and diode D from x2Out to yOut.
 */
import { z } from '../zod';

export const DOCUMENT_SCHEMA_VERSION = 1;

/** Largest number of blocks and wires one document may hold (documented limit). */
export const MAX_BLOCKS = 2000;
export const MAX_EDGES = 6000;

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
const positive = finite.refine((v) => v > 0, { message: 'must be greater than zero' });
const nonNegative = finite.refine((v) => v >= 0, { message: 'must not be negative' });
const idSchema = z.string().min(1).max(64).regex(/^[A-Za-z0-9_.:-]+$/, 'letters, digits, _ . : - only');
const optionalPartId = z.string().max(64).nullable().optional();

export const diodeModelParamsSchema = z.object({
  /** Saturation current IS (A). */
  isA: positive,
  /** Emission coefficient N. */
  n: positive,
  /** Series resistance RS (ohm). */
  rsOhm: nonNegative,
  /** Reverse breakdown BV (V); omitted = not modelled. */
  bvV: positive.optional(),
  /** Zero-bias junction capacitance CJO (F). */
  cjoF: nonNegative.optional(),
  /** Transit time TT (s). */
  ttS: nonNegative.optional(),
});
export type DiodeModelParams = z.infer<typeof diodeModelParamsSchema>;

export const capacitorSpecSchema = z.object({
  capacitanceF: positive,
  esrOhm: nonNegative.optional(),
  /** Rated DC voltage (V). */
  ratedVoltageV: positive.optional(),
  /** Relative tolerance, e.g. 0.1 for ±10 %. */
  tolerance: nonNegative.optional(),
  partId: optionalPartId,
});
export type CapacitorSpec = z.infer<typeof capacitorSpecSchema>;

export const diodeSpecSchema = z.object({
  model: diodeModelParamsSchema,
  /** Repetitive peak reverse voltage rating VRRM (V). */
  ratedPivV: positive.optional(),
  /** Average forward current rating (A). */
  ratedAvgCurrentA: positive.optional(),
  /** Surge (non-repetitive peak) current rating (A). */
  ratedSurgeA: positive.optional(),
  partId: optionalPartId,
});
export type DiodeSpec = z.infer<typeof diodeSpecSchema>;

const position = z.object({ x: finite, y: finite });
const label = z.string().max(80).optional();

export const acSourceDataSchema = z.object({
  variant: z.enum(['single', 'centreTapped']),
  /** Amplitude as entered, and whether it is the peak or the RMS value (sine). */
  amplitudeV: positive,
  amplitudeMode: z.enum(['peak', 'rms']),
  frequencyHz: positive,
  phaseDeg: finite.default(0),
  /** Series (winding/inverter) resistance in each leg (ohm). */
  sourceResistanceOhm: nonNegative.default(0),
});

export const dcSourceDataSchema = z.object({
  voltageV: finite,
  sourceResistanceOhm: nonNegative.default(0),
});

export const stageDataSchema = z.object({
  variant: z.enum(['half', 'full']),
  polarity: z.enum(['positive', 'negative']),
  pumpC: capacitorSpecSchema,
  smoothC: capacitorSpecSchema,
  /** Second pumping capacitor (full-wave only). */
  pump2C: capacitorSpecSchema.optional(),
  diodeA: diodeSpecSchema,
  diodeB: diodeSpecSchema,
  /** Diodes of the second driven column (full-wave only). */
  diodeC: diodeSpecSchema.optional(),
  diodeD: diodeSpecSchema.optional(),
});

export const loadDataSchema = z.discriminatedUnion('mode', [
  z.object({ mode: z.literal('resistor'), resistanceOhm: positive }),
  z.object({ mode: z.literal('current'), currentA: nonNegative }),
]);

export const resistorDataSchema = z.object({
  resistanceOhm: positive,
  ratedPowerW: positive.optional(),
  ratedVoltageV: positive.optional(),
  partId: optionalPartId,
});

const blockBase = { id: idSchema, position, label };

export const designBlockSchema = z.discriminatedUnion('kind', [
  z.object({ ...blockBase, kind: z.literal('acSource'), data: acSourceDataSchema }),
  z.object({ ...blockBase, kind: z.literal('dcSource'), data: dcSourceDataSchema }),
  z.object({ ...blockBase, kind: z.literal('stage'), data: stageDataSchema }),
  z.object({ ...blockBase, kind: z.literal('load'), data: loadDataSchema }),
  z.object({ ...blockBase, kind: z.literal('ground'), data: z.object({}).default({}) }),
  z.object({ ...blockBase, kind: z.literal('capacitor'), data: capacitorSpecSchema }),
  z.object({ ...blockBase, kind: z.literal('diode'), data: diodeSpecSchema }),
  z.object({ ...blockBase, kind: z.literal('resistor'), data: resistorDataSchema }),
]);
export type DesignBlock = z.infer<typeof designBlockSchema>;
export type BlockKind = DesignBlock['kind'];

export const wireSchema = z.object({
  id: idSchema,
  source: idSchema,
  sourcePort: z.string().min(1).max(32),
  target: idSchema,
  targetPort: z.string().min(1).max(32),
});
export type Wire = z.infer<typeof wireSchema>;

export const designSettingsSchema = z.object({
  /** Stray capacitance from every ladder node to ground (F); 0 = none. */
  strayCapacitanceF: nonNegative.default(0),
  /** Bleeder resistance across the output (ohm); omitted = no bleeder fitted. */
  bleederOhm: positive.optional(),
  /** Derating: a part's stress must stay below this fraction of its rating (common practice 0.8). */
  deratingFraction: positive.refine((v) => v <= 1, 'must be at most 1').default(0.8),
  /** What the design must meet (for the report and the checks). */
  requirement: z
    .object({
      outputV: finite.optional(),
      loadCurrentA: nonNegative.optional(),
      maxRippleFraction: positive.optional(),
    })
    .optional(),
});
export type DesignSettings = z.infer<typeof designSettingsSchema>;

export const designDocumentSchema = z
  .object({
    schemaVersion: z.literal(DOCUMENT_SCHEMA_VERSION),
    blocks: z.array(designBlockSchema).max(MAX_BLOCKS),
    wires: z.array(wireSchema).max(MAX_EDGES),
    settings: designSettingsSchema.default({ strayCapacitanceF: 0, deratingFraction: 0.8 }),
  })
  .superRefine((doc, ctx) => {
    const ids = new Set<string>();
    doc.blocks.forEach((b, i) => {
      if (ids.has(b.id)) ctx.addIssue({ code: 'custom', message: `duplicate block id ${b.id}`, path: ['blocks', i, 'id'] });
      ids.add(b.id);
    });
    doc.wires.forEach((w, i) => {
      if (!ids.has(w.source)) ctx.addIssue({ code: 'custom', message: `wire ${w.id} starts at unknown block ${w.source}`, path: ['wires', i, 'source'] });
      if (!ids.has(w.target)) ctx.addIssue({ code: 'custom', message: `wire ${w.id} ends at unknown block ${w.target}`, path: ['wires', i, 'target'] });
    });
  });
export type DesignDocument = z.infer<typeof designDocumentSchema>;
/** The document as written by a client before defaults are applied. */
export type DesignDocumentInput = z.input<typeof designDocumentSchema>;

/** Ports each block kind exposes (see the file header). */
export function portsOf(block: DesignBlock): string[] {
  switch (block.kind) {
    case 'acSource':
      return block.data.variant === 'single' ? ['hot', 'ret'] : ['hot', 'ct', 'hotB'];
    case 'dcSource':
      return ['pos', 'neg'];
    case 'stage':
      return block.data.variant === 'half'
        ? ['xIn', 'yIn', 'xOut', 'yOut']
        : ['xIn', 'x2In', 'yIn', 'xOut', 'x2Out', 'yOut'];
    case 'load':
    case 'capacitor':
    case 'resistor':
      return ['a', 'b'];
    case 'ground':
      return ['g'];
    case 'diode':
      return ['anode', 'cathode'];
  }
}
