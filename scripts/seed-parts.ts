/**
 * Demo parts library for the team "Tallgrass Instruments" (invented scenario): six capacitors
 * across dielectrics and voltages, four high-voltage diodes with model parameters and ratings,
 * three resistors including a bleeder-grade HV resistor. Every maker and part number is invented.
 * One diode carries a small generated datasheet PDF (pdfkit) in object storage; its model was
 * fitted to the invented forward points printed on that sheet with lib/circuit/devices/diode-fit.
 *
 * Idempotent: every part has a fixed id and is created only when missing; the datasheet object
 * is put only when missing. The team's derating policy is set to 0.8 when the parts are first
 * created (a later owner's change is left alone).
 */
import PDFDocument from 'pdfkit';
import { Op, type Transaction } from 'sequelize';
import { db } from '../lib/db';
import { fitDiode } from '../lib/circuit/devices/diode-fit';
import { partInputSchema, type PartInputRaw } from '../lib/parts/schema';
import { getObject, putObject } from '../lib/storage';

const partId = (n: number) => `00000a17-5eed-4000-8000-${n.toString(16).padStart(12, '0')}`;

/** Invented forward points of the 12 kV stack, as its (invented) datasheet prints them. */
export const DEMO_FORWARD_POINTS = [
  { currentA: 1e-3, voltageV: 9.4 },
  { currentA: 10e-3, voltageV: 11.6 },
  { currentA: 0.2, voltageV: 19.5 },
];

function fittedStack() {
  const fit = fitDiode(DEMO_FORWARD_POINTS);
  if (!fit.ok) throw new Error(`demo diode fit failed: ${fit.reason}`);
  const sig = (v: number) => Number(v.toPrecision(4));
  return { isA: sig(fit.model.isA), n: sig(fit.model.n), rsOhm: sig(fit.model.rsOhm) };
}

/** The demo parts, by fixed id (the e2e binds a diode of the 4-stage bias ladder; see tests/e2e/parts.spec.ts). */
export function demoParts(): { id: string; input: PartInputRaw }[] {
  const maker = { cer: 'Meadowlark Ceramics', film: 'Kestrel Film Works', semi: 'Basalt Semiconductor', res: 'Foxglove Resistive' };
  const list: PartInputRaw[] = [
    { kind: 'capacitor', partNumber: 'TGC-1N0-15K-C1', description: 'Doorknob, class 1 ceramic, 15 kV', maker: maker.cer, unitCost: 2.9, specs: { capacitanceF: 1e-9, tolerance: 0.1, ratedVoltageV: 15_000, esrOhm: 0.3, dielectric: 'ceramic-class1', size: '32 × 18 mm' } },
    { kind: 'capacitor', partNumber: 'TGC-2N2-10K-C2', description: 'Disc, class 2 ceramic, 10 kV', maker: maker.cer, unitCost: 0.85, specs: { capacitanceF: 2.2e-9, tolerance: 0.2, ratedVoltageV: 10_000, dielectric: 'ceramic-class2', size: '⌀ 16 mm' } },
    { kind: 'capacitor', partNumber: 'TGC-470P-30K-C1', description: 'Doorknob, class 1 ceramic, 30 kV', maker: maker.cer, unitCost: 6.4, specs: { capacitanceF: 470e-12, tolerance: 0.1, ratedVoltageV: 30_000, dielectric: 'ceramic-class1', size: '40 × 24 mm' } },
    { kind: 'capacitor', partNumber: 'TGC-10N-3K0-PP', description: 'Polypropylene film, pulse grade, 3 kV', maker: maker.film, unitCost: 1.6, specs: { capacitanceF: 10e-9, tolerance: 0.05, ratedVoltageV: 3000, esrOhm: 0.5, dielectric: 'film-polypropylene', size: '26 × 12 mm' } },
    { kind: 'capacitor', partNumber: 'TGC-10N-630-PET', description: 'Polyester film, 630 V (bias ladder)', maker: maker.film, unitCost: 0.22, specs: { capacitanceF: 10e-9, tolerance: 0.1, ratedVoltageV: 630, dielectric: 'film-polyester', size: '7.5 mm pitch' } },
    { kind: 'capacitor', partNumber: 'TGC-1N0-2K0-MICA', description: 'Silvered mica, 1 %, 2 kV', maker: maker.film, unitCost: 3.1, specs: { capacitanceF: 1e-9, tolerance: 0.01, ratedVoltageV: 2000, dielectric: 'mica' } },
    { kind: 'diode', partNumber: 'TGD-1K0-1A', description: 'General rectifier, 1 kV 1 A', maker: maker.semi, unitCost: 0.08, specs: { ratedPivV: 1000, ratedAvgCurrentA: 1, ratedSurgeA: 30, trrS: 2e-6, model: { isA: 2.5e-9, n: 1.75, rsOhm: 0.05, cjoF: 15e-12, ttS: 4e-6 } } },
    { kind: 'diode', partNumber: 'TGD-10K-20M', description: 'HV rectifier stack, 10 kV 20 mA, fast', maker: maker.semi, unitCost: 1.45, specs: { ratedPivV: 10_000, ratedAvgCurrentA: 0.02, ratedSurgeA: 2, trrS: 100e-9, model: { isA: 5e-9, n: 8, rsOhm: 20, bvV: 12_000, cjoF: 1e-12 } } },
    { kind: 'diode', partNumber: 'TGD-12K-20M', description: 'HV rectifier stack, 12 kV 20 mA (model fitted to the datasheet curve)', maker: maker.semi, unitCost: 1.8, specs: { ratedPivV: 12_000, ratedAvgCurrentA: 0.02, ratedSurgeA: 2, trrS: 150e-9, model: { ...fittedStack(), cjoF: 1.5e-12 } } },
    { kind: 'diode', partNumber: 'TGD-20K-5M', description: 'HV rectifier stick, 20 kV 5 mA, epoxy', maker: maker.semi, unitCost: 3.75, specs: { ratedPivV: 20_000, ratedAvgCurrentA: 0.005, ratedSurgeA: 0.5, trrS: 70e-9, model: { isA: 1e-11, n: 30, rsOhm: 150, cjoF: 0.8e-12 } } },
    { kind: 'resistor', partNumber: 'TGR-100M-15K-BL', description: 'Bleeder-grade thick film, 100 MΩ 15 kV', maker: maker.res, unitCost: 4.2, specs: { resistanceOhm: 100e6, tolerance: 0.01, ratedPowerW: 2, ratedVoltageV: 15_000 } },
    { kind: 'resistor', partNumber: 'TGR-1G0-40K-DV', description: 'HV divider resistor, 1 GΩ 40 kV', maker: maker.res, unitCost: 9.5, specs: { resistanceOhm: 1e9, tolerance: 0.01, ratedPowerW: 1, ratedVoltageV: 40_000 } },
    { kind: 'resistor', partNumber: 'TGR-10K-5W-WW', description: 'Wirewound surge limiter, 10 kΩ 5 W', maker: maker.res, unitCost: 0.6, specs: { resistanceOhm: 10e3, tolerance: 0.05, ratedPowerW: 5, ratedVoltageV: 1000 } },
  ];
  return list.map((input, i) => ({ id: partId(i + 1), input }));
}

/** The part that carries the demo datasheet. */
export const DEMO_DATASHEET_PART = 'TGD-12K-20M';
const DATASHEET_NAME = 'TGD-12K-20M-datasheet-demo.pdf';

/** A one-page invented datasheet for the 12 kV stack (ratings, forward points, cautions). */
export function demoDatasheetPdf(): Promise<Uint8Array> {
  const pdf = new PDFDocument({ size: 'A4', margin: 56, info: { Title: 'TGD-12K-20M (invented demo datasheet)', Creator: 'Kilorung demo seed', Producer: 'Kilorung', CreationDate: new Date('2026-11-01T00:00:00Z') } });
  const chunks: Buffer[] = [];
  pdf.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Uint8Array>((resolve, reject) => {
    pdf.on('end', () => resolve(new Uint8Array(Buffer.concat(chunks))));
    pdf.on('error', reject);
  });
  pdf.font('Helvetica-Bold').fontSize(18).text('TGD-12K-20M');
  pdf.font('Helvetica').fontSize(11).text('High-voltage rectifier stack, 12 kV, 20 mA — Basalt Semiconductor');
  pdf.moveDown(0.5).fontSize(9).fillColor('#a33').text('INVENTED DEMO DATASHEET for the Kilorung demo team. Not a real product; do not design from it.');
  pdf.fillColor('#000').moveDown();
  pdf.font('Helvetica-Bold').fontSize(12).text('Ratings');
  pdf.font('Helvetica').fontSize(10);
  for (const line of ['Repetitive peak reverse voltage VRRM: 12 kV', 'Average forward current IF(AV): 20 mA', 'Non-repetitive surge current IFSM: 2 A', 'Reverse recovery time trr: 150 ns', 'Junction capacitance: 1.5 pF']) pdf.text(line);
  pdf.moveDown();
  pdf.font('Helvetica-Bold').fontSize(12).text('Forward characteristic (typical, 27 °C)');
  pdf.font('Helvetica').fontSize(10);
  for (const p of DEMO_FORWARD_POINTS) pdf.text(`IF = ${(p.currentA * 1e3).toString()} mA    VF = ${p.voltageV.toFixed(1)} V`);
  pdf.moveDown();
  pdf.font('Helvetica-Bold').fontSize(12).text('Caution');
  pdf.font('Helvetica').fontSize(10).text(
    'Multiplier stacks store a lethal charge after the supply is switched off. Fit bleeders, discharge every stage to ground with an insulated discharge stick and ground it before touching, and follow local codes and licensed practice.',
  );
  pdf.end();
  return done;
}

/** Create the demo parts of `teamId` once; returns how many rows it created. */
export async function seedParts(transaction: Transaction, o: { teamId: string; createdBy: string }): Promise<number> {
  const { Part } = db().models;
  let made = 0;
  for (const { id, input } of demoParts()) {
    if (await Part.findByPk(id, { transaction })) continue;
    const p = partInputSchema.parse(input);
    const { sequelize } = db();
    const clash = await Part.findOne({ where: { teamId: o.teamId, [Op.and]: [sequelize.where(sequelize.fn('lower', sequelize.col('part_number')), p.partNumber.toLowerCase())] }, transaction });
    if (clash) continue;
    await Part.create(
      { id, teamId: o.teamId, kind: p.kind, partNumber: p.partNumber, description: p.description, maker: p.maker, unitCost: p.unitCost ?? null, currency: p.currency, specs: p.specs as Record<string, unknown>, createdBy: o.createdBy },
      { transaction },
    );
    made += 1;
  }
  if (made === demoParts().length) await db().sequelize.query('UPDATE teams SET derating_fraction = 0.8 WHERE id = :id', { replacements: { id: o.teamId }, transaction });

  const sheetPart = demoParts().find((d) => d.input.partNumber === DEMO_DATASHEET_PART)!;
  const row = await Part.findByPk(sheetPart.id, { transaction });
  if (row && !row.datasheetKey) {
    const key = `teams/${o.teamId}/parts/${sheetPart.id}/datasheet-00000a17-5eed-4000-8000-d5d5d5d5d5d5.pdf`;
    try {
      const bytes = await demoDatasheetPdf();
      if (!(await getObject(key))) await putObject(key, bytes, 'application/pdf');
      row.set({ datasheetKey: key, datasheetName: DATASHEET_NAME, datasheetSize: bytes.byteLength, datasheetUploadedAt: new Date('2026-11-01T09:00:00Z') });
      await row.save({ transaction });
    } catch (e) {
      console.log(`[seed] demo datasheet not put in object storage (${e instanceof Error ? e.message : String(e)}); run the seed again with the fakes up to add it`);
    }
  }
  return made;
}
