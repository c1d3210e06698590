/**
 * The team parts library: what a stored part is, per kind. Shared by the routes (server), the
 * CSV import, the library page and the canvas binding (browser), so it imports `z` from the
 * jitless zod (see lib/circuit/zod.ts). Values are SI numbers; engineering notation exists only at
 * the UI edge and in the CSV import.
 *
 * Binding a design's capacitor or diode to a part copies the part's values into the document
 * (with `partId`), so a stored revision always solves the same way even if the library changes.
 */
import { z } from '../circuit/zod';
import { diodeModelParamsSchema } from '../circuit/document/schema';

export const PART_KINDS = ['capacitor', 'diode', 'resistor'] as const;
export const partKindSchema = z.enum(PART_KINDS);
export type PartKind = z.infer<typeof partKindSchema>;

/** Capacitor dielectrics a designer picks from (trade terms). */
export const DIELECTRICS = ['ceramic-class1', 'ceramic-class2', 'film-polypropylene', 'film-polyester', 'mica', 'paper-oil', 'other'] as const;
export const dielectricSchema = z.enum(DIELECTRICS);

const finite = z.number().refine(Number.isFinite, { message: 'must be a finite number' });
const positive = finite.refine((v) => v > 0, { message: 'must be greater than zero' });
const nonNegative = finite.refine((v) => v >= 0, { message: 'must not be negative' });
/** Relative tolerance, 0 … 1 (0.1 = ±10 %). */
const tolerance = nonNegative.refine((v) => v <= 1, { message: 'must be at most 1 (100 %)' });

export const capacitorPartSpecsSchema = z.object({
  capacitanceF: positive,
  tolerance,
  /** Rated DC voltage (V). */
  ratedVoltageV: positive,
  esrOhm: nonNegative.optional(),
  dielectric: dielectricSchema,
  /** Body size as printed on the datasheet, e.g. "32 × 18 mm". */
  size: z.string().trim().max(40).optional(),
});
export type CapacitorPartSpecs = z.infer<typeof capacitorPartSpecsSchema>;

export const diodePartSpecsSchema = z.object({
  /** Repetitive peak reverse voltage VRRM (V). */
  ratedPivV: positive,
  /** Average forward current IF(AV) (A). */
  ratedAvgCurrentA: positive,
  /** Non-repetitive surge current IFSM (A). */
  ratedSurgeA: positive.optional(),
  /** Reverse recovery time trr (s). */
  trrS: nonNegative.optional(),
  /** Shockley-model parameters the engine uses (IS, N, RS, CJO, TT). */
  model: diodeModelParamsSchema,
});
export type DiodePartSpecs = z.infer<typeof diodePartSpecsSchema>;

export const resistorPartSpecsSchema = z.object({
  resistanceOhm: positive,
  tolerance: tolerance.optional(),
  ratedPowerW: positive,
  /** Maximum working voltage (V). */
  ratedVoltageV: positive,
});
export type ResistorPartSpecs = z.infer<typeof resistorPartSpecsSchema>;

const common = {
  /** The team's own part number, unique within the team. */
  partNumber: z.string().trim().min(1, 'required').max(64).regex(/^[A-Za-z0-9][A-Za-z0-9 ._/+#-]*$/, 'letters, digits, space and . _ / + # - only'),
  description: z.string().trim().max(200).default(''),
  /** Maker as the team writes it (demo data: invented names only). */
  maker: z.string().trim().max(80).default(''),
  /** Price of one piece, in `currency`. */
  unitCost: nonNegative.optional(),
  currency: z.string().regex(/^[A-Z]{3}$/, 'a three-letter currency code').default('EUR'),
};

/** A part as created or replaced by a client (PATCH takes the same body). */
export const partInputSchema = z.discriminatedUnion('kind', [
  z.object({ ...common, kind: z.literal('capacitor'), specs: capacitorPartSpecsSchema }),
  z.object({ ...common, kind: z.literal('diode'), specs: diodePartSpecsSchema }),
  z.object({ ...common, kind: z.literal('resistor'), specs: resistorPartSpecsSchema }),
]);
export type PartInput = z.infer<typeof partInputSchema>;
export type PartInputRaw = z.input<typeof partInputSchema>;

/** A stored datasheet (the bytes live in object storage). */
export interface DatasheetDto {
  fileName: string;
  sizeBytes: number;
  uploadedAt: string;
}

/** A part as the API returns it. */
export type PartDto = PartInput & {
  id: string;
  teamId: string;
  datasheet: DatasheetDto | null;
  createdAt: string;
  updatedAt: string;
};

/** GET /api/teams/:teamId/parts query. */
export const partListQuerySchema = z.object({
  q: z.string().max(120).optional(),
  kind: partKindSchema.optional(),
  sort: z.enum(['partNumber', 'kind', 'maker', 'unitCost', 'updated']).optional(),
  dir: z.enum(['asc', 'desc']).optional(),
});

/** POST /api/teams/:teamId/parts/import: the CSV text (the client reads the file); dryRun checks only. */
export const partImportSchema = z.object({
  csv: z.string().min(1, 'the file is empty').max(900_000),
  dryRun: z.boolean().optional(),
});

export interface PartImportRejection {
  /** 1-based line in the file (the header is line 1). */
  line: number;
  partNumber: string | null;
  reasons: string[];
}
export interface PartImportReport {
  created: number;
  /** Rows whose part number already existed in the team and were replaced. */
  updated: number;
  rejected: PartImportRejection[];
  dryRun: boolean;
}

/** The team's derating policy (owner sets it): a part's stress must stay below this fraction of its rating. */
export const partsPolicySchema = z.object({
  deratingFraction: positive.refine((v) => v <= 1, 'must be at most 1'),
});
export type PartsPolicy = z.infer<typeof partsPolicySchema>;

/** Largest datasheet accepted (bytes). */
export const MAX_DATASHEET_BYTES = 10 * 1024 * 1024;
