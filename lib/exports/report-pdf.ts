/**
 * The design report as a PDF, drawn on the server with pdfkit in its built-in Helvetica (no
 * font files fetched or embedded). Sections, in order: title block, the drawing, requirement vs
 * result, per-node table, per-part stress table, waveforms (output over one period) and the
 * warm-up plot, safety (stored energy, bleeder, discharge, cautions) and the revision and approval
 * record. Everything is vector: the drawing is made from the document's block positions and port
 * anchors (lib/circuit/document/geometry.ts) with each part's designator, the plots are polylines
 * on labelled axes.
 *
 * The standard PDF fonts cover WinAnsi only, so text passes through {@link pdfText} (Ω → "Ohm",
 * − → "-", …) before it is written.
 */
import PDFDocument from 'pdfkit';
import { blockSize, portAnchors, portPosition, type DesignBlock, type DesignDocument } from '../circuit';
import { designatorKey } from '../circuit/document/designators';
import { eng, type ReportModel, type Series } from './report';

type Doc = InstanceType<typeof PDFDocument>;

const PAGE = { width: 595.28, height: 841.89, margin: 48 };
const COLORS = { ink: '#1b2329', muted: '#5b6770', copper: '#b4622a', lagoon: '#1f7f77', hazard: '#c62f2f', rule: '#c9d1d7', grid: '#e4e8eb' };

const WINANSI_EXTRA = new Set('€‚ƒ„…†‡ˆ‰Š‹ŒŽ‘’“”•–—˜™š›œžŸ');
const REPLACE: Record<string, string> = { 'Ω': 'Ohm', '−': '-', '′': "'", '≤': '<=', '≥': '>=', '→': '->', '≈': '~', '√': 'sqrt', '∞': 'inf', '✓': 'ok' };

/** `s` with every character the standard fonts cannot show replaced by a plain spelling (or `?`). */
export function pdfText(s: string): string {
  let out = '';
  for (const ch of s) {
    const code = ch.codePointAt(0) as number;
    if (code <= 0xff || WINANSI_EXTRA.has(ch)) out += ch;
    else out += REPLACE[ch] ?? '?';
  }
  return out;
}

function fmtDate(iso: string): string {
  const d = new Date(iso);
  return Number.isNaN(d.getTime()) ? iso : `${d.toISOString().slice(0, 16).replace('T', ' ')} UTC`;
}

class Writer {
  y = PAGE.margin;
  constructor(readonly pdf: Doc) {}
  get left() {
    return PAGE.margin;
  }
  get width() {
    return PAGE.width - 2 * PAGE.margin;
  }
  get bottom() {
    return PAGE.height - PAGE.margin;
  }
  need(h: number) {
    if (this.y + h > this.bottom) this.newPage();
  }
  newPage() {
    this.pdf.addPage();
    this.y = PAGE.margin;
  }
  heading(text: string) {
    this.need(60);
    this.y += 8;
    this.pdf.font('Helvetica-Bold').fontSize(13).fillColor(COLORS.ink).text(pdfText(text), this.left, this.y, { width: this.width });
    this.y = this.pdf.y + 2;
    this.pdf.moveTo(this.left, this.y).lineTo(this.left + this.width, this.y).lineWidth(0.6).strokeColor(COLORS.copper).stroke();
    this.y += 6;
  }
  para(text: string, opts: { size?: number; color?: string; bold?: boolean } = {}) {
    const size = opts.size ?? 9;
    this.pdf.font(opts.bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(size);
    const h = this.pdf.heightOfString(pdfText(text), { width: this.width });
    this.need(h + 4);
    this.pdf.fillColor(opts.color ?? COLORS.ink).text(pdfText(text), this.left, this.y, { width: this.width });
    this.y = this.pdf.y + 3;
  }
  /** Label–value pairs, one per line (the title block): the label in bold, the value wrapped beside it. */
  fields(pairs: Array<[string, string]>) {
    const labelW = 70;
    for (const [label, value] of pairs) {
      this.pdf.font('Helvetica').fontSize(9);
      const h = this.pdf.heightOfString(pdfText(value), { width: this.width - labelW });
      this.need(h + 2);
      this.pdf.font('Helvetica-Bold').fontSize(9).fillColor(COLORS.muted).text(pdfText(label), this.left, this.y, { width: labelW, lineBreak: false });
      this.pdf.font('Helvetica').fontSize(9).fillColor(COLORS.ink).text(pdfText(value), this.left + labelW, this.y, { width: this.width - labelW });
      this.y = this.pdf.y + 1;
    }
    this.y += 4;
  }
  /** A table; `widths` are fractions of the text width. Rows break across pages with the header repeated. */
  table(header: string[], rows: string[][], widths: number[], opts: { rowColor?: (i: number) => string | null } = {}) {
    const size = 7.5;
    const pad = 2;
    const cols = widths.map((w) => w * this.width);
    const drawRow = (cells: string[], bold: boolean, color: string) => {
      this.pdf.font(bold ? 'Helvetica-Bold' : 'Helvetica').fontSize(size);
      const h = Math.max(...cells.map((c, i) => this.pdf.heightOfString(pdfText(c), { width: cols[i] - 2 * pad }))) + 2 * pad;
      return { h, draw: () => {
        let x = this.left;
        cells.forEach((c, i) => {
          this.pdf.fillColor(color).text(pdfText(c), x + pad, this.y + pad, { width: cols[i] - 2 * pad });
          x += cols[i];
        });
        this.y += h;
        this.pdf.moveTo(this.left, this.y).lineTo(this.left + this.width, this.y).lineWidth(0.3).strokeColor(COLORS.rule).stroke();
      } };
    };
    const head = () => {
      const r = drawRow(header, true, COLORS.ink);
      this.need(r.h + 14);
      r.draw();
    };
    head();
    rows.forEach((cells, i) => {
      const r = drawRow(cells, false, opts.rowColor?.(i) ?? COLORS.ink);
      if (this.y + r.h > this.bottom) {
        this.newPage();
        head();
      }
      r.draw();
    });
    this.y += 6;
  }
}

// ---------- the drawing ----------

interface Box {
  minX: number;
  minY: number;
  maxX: number;
  maxY: number;
}

function boundsOf(doc: DesignDocument): Box | null {
  if (doc.blocks.length === 0) return null;
  const b: Box = { minX: Infinity, minY: Infinity, maxX: -Infinity, maxY: -Infinity };
  for (const block of doc.blocks) {
    const { width, height } = blockSize(block);
    b.minX = Math.min(b.minX, block.position.x);
    b.minY = Math.min(b.minY, block.position.y);
    b.maxX = Math.max(b.maxX, block.position.x + width);
    b.maxY = Math.max(b.maxY, block.position.y + height);
  }
  return b;
}

type Pt = { x: number; y: number };

function drawPart(pdf: Doc, shape: 'capacitor' | 'diode' | 'resistor', a: Pt, b: Pt, k: number, label: string | undefined, labelSide: 1 | -1) {
  const dx = b.x - a.x;
  const dy = b.y - a.y;
  const len = Math.hypot(dx, dy);
  if (len === 0) return;
  const ux = dx / len;
  const uy = dy / len;
  const nx = -uy;
  const ny = ux;
  const mx = (a.x + b.x) / 2;
  const my = (a.y + b.y) / 2;
  const body = { capacitor: 5, diode: 9, resistor: 14 }[shape] * k;
  const s = Math.min(body, len / 2);
  pdf.lineWidth(0.7).strokeColor(COLORS.muted);
  pdf.moveTo(a.x, a.y).lineTo(mx - ux * s, my - uy * s).stroke();
  pdf.moveTo(mx + ux * s, my + uy * s).lineTo(b.x, b.y).stroke();
  pdf.strokeColor(COLORS.copper).lineWidth(1);
  const at = (along: number, across: number): [number, number] => [mx + ux * along + nx * across, my + uy * along + ny * across];
  if (shape === 'capacitor') {
    for (const off of [-5, 5]) {
      pdf.moveTo(...at(off * k, -11 * k)).lineTo(...at(off * k, 11 * k)).stroke();
    }
  } else if (shape === 'diode') {
    pdf.moveTo(...at(-9 * k, -9 * k)).lineTo(...at(7 * k, 0)).lineTo(...at(-9 * k, 9 * k)).closePath().stroke();
    pdf.moveTo(...at(8 * k, -9 * k)).lineTo(...at(8 * k, 9 * k)).stroke();
  } else {
    const c = [at(-14 * k, -5 * k), at(14 * k, -5 * k), at(14 * k, 5 * k), at(-14 * k, 5 * k)];
    pdf.moveTo(...c[0]).lineTo(...c[1]).lineTo(...c[2]).lineTo(...c[3]).closePath().stroke();
  }
  if (label) {
    const off = 16 * k + 2;
    const lx = mx + nx * off * labelSide;
    const ly = my + ny * off * labelSide;
    pdf.font('Helvetica-Bold').fontSize(6.5).fillColor(COLORS.lagoon);
    const w = pdf.widthOfString(label);
    pdf.text(label, lx - w / 2, ly - 3, { lineBreak: false });
  }
}

function drawBlock(pdf: Doc, block: DesignBlock, map: (p: Pt) => Pt, k: number, des: Record<string, string>) {
  const { width, height } = blockSize(block);
  const o = map(block.position);
  const anchors = Object.fromEntries(portAnchors(block).map((a) => [a.port, map({ x: block.position.x + a.x, y: block.position.y + a.y })]));
  const local = (x: number, y: number) => map({ x: block.position.x + x, y: block.position.y + y });
  const lead = (...pts: Pt[]) => {
    pdf.lineWidth(0.7).strokeColor(COLORS.muted).moveTo(pts[0].x, pts[0].y);
    for (const p of pts.slice(1)) pdf.lineTo(p.x, p.y);
    pdf.stroke();
  };
  pdf.lineWidth(0.3).strokeColor(COLORS.grid).rect(o.x, o.y, width * k, height * k).stroke();
  const name = pdfText(block.label ?? block.id);
  pdf.font('Helvetica').fontSize(6).fillColor(COLORS.muted).text(name, o.x + 2, o.y + 2, { width: width * k - 4, lineBreak: false, ellipsis: true });
  switch (block.kind) {
    case 'stage': {
      const d = block.data;
      const full = d.variant === 'full';
      const neg = d.polarity === 'negative';
      const jxX = full ? 185 : 150;
      const yRow = full ? 170 : 130;
      const jx = local(jxX, 30);
      const ky = local(14, yRow);
      const jy = local(jxX, yRow);
      const j2 = full ? local(120, 100) : null;
      const jy2 = full ? local(120, yRow) : null;
      const smoothEnd = full ? (jy2 as Pt) : jy;
      const D = (role: string) => des[designatorKey(block.id, role)];
      const diode = (from: Pt, to: Pt, role: string) => (neg ? drawPart(pdf, 'diode', to, from, k, D(role), 1) : drawPart(pdf, 'diode', from, to, k, D(role), 1));
      drawPart(pdf, 'capacitor', anchors.xIn, jx, k, D('pumpC'), -1);
      lead(jx, anchors.xOut);
      if (full && j2) {
        drawPart(pdf, 'capacitor', anchors.x2In, j2, k, D('pump2C'), -1);
        lead(j2, anchors.x2Out);
      }
      lead(anchors.yIn, ky);
      drawPart(pdf, 'capacitor', ky, smoothEnd, k, D('smoothC'), 1);
      lead(smoothEnd, anchors.yOut);
      diode(ky, jx, 'diodeA');
      diode(jx, jy, 'diodeB');
      if (full && j2 && jy2) {
        diode(ky, j2, 'diodeC');
        diode(j2, jy2, 'diodeD');
      }
      break;
    }
    case 'capacitor':
      drawPart(pdf, 'capacitor', anchors.a, anchors.b, k, des[block.id], -1);
      break;
    case 'resistor':
      drawPart(pdf, 'resistor', anchors.a, anchors.b, k, des[block.id], -1);
      break;
    case 'diode':
      drawPart(pdf, 'diode', anchors.anode, anchors.cathode, k, des[block.id], -1);
      break;
    case 'load': {
      const top = { x: anchors.b.x, y: anchors.a.y };
      lead(anchors.a, top);
      drawPart(pdf, 'resistor', top, anchors.b, k, undefined, 1);
      break;
    }
    case 'ground': {
      const g = anchors.g;
      pdf.lineWidth(0.9).strokeColor(COLORS.muted);
      pdf.moveTo(g.x, g.y).lineTo(g.x, g.y + 12 * k).stroke();
      for (const [hw, dy] of [[14, 12], [9, 18], [4, 24]]) pdf.moveTo(g.x - hw * k, g.y + dy * k).lineTo(g.x + hw * k, g.y + dy * k).stroke();
      break;
    }
    case 'acSource':
    case 'dcSource': {
      const c = local(width / 2, 62);
      pdf.lineWidth(1).strokeColor(COLORS.copper).circle(c.x, c.y, 16 * k).stroke();
      const first = Object.values(anchors)[0];
      lead(first, { x: c.x, y: first.y }, { x: c.x, y: c.y - 16 * k });
      const ret = anchors.ret ?? anchors.ct ?? anchors.neg;
      if (ret) lead({ x: c.x, y: c.y + 16 * k }, ret);
      if (anchors.hotB) lead(local(width / 2 + 16, 62), { x: anchors.hotB.x - 6 * k, y: c.y }, { x: anchors.hotB.x - 6 * k, y: anchors.hotB.y }, anchors.hotB);
      const text = block.kind === 'acSource' ? `${eng(block.data.amplitudeV, 'V')} ${block.data.amplitudeMode === 'rms' ? 'rms' : 'pk'} ${eng(block.data.frequencyHz, 'Hz')}` : eng(block.data.voltageV, 'V');
      pdf.font('Helvetica').fontSize(6).fillColor(COLORS.ink).text(pdfText(text), o.x + 2, o.y + height * k - 10, { width: width * k - 4, lineBreak: false });
      break;
    }
  }
}

/** The document drawn into the box (x, y, w, h) on the current page: blocks, then wires as right-angled runs. */
function drawDocument(pdf: Doc, doc: DesignDocument, des: Record<string, string>, x: number, y: number, w: number, h: number): number {
  const b = boundsOf(doc);
  if (!b) {
    pdf.font('Helvetica').fontSize(9).fillColor(COLORS.muted).text('The drawing is empty.', x, y);
    return 14;
  }
  const pad = 20;
  const k = Math.min(w / (b.maxX - b.minX + 2 * pad), h / (b.maxY - b.minY + 2 * pad), 1.2);
  const ox = x + (w - (b.maxX - b.minX + 2 * pad) * k) / 2;
  const map = (p: Pt): Pt => ({ x: ox + (p.x - b.minX + pad) * k, y: y + (p.y - b.minY + pad) * k });
  const byId = new Map(doc.blocks.map((bl) => [bl.id, bl] as const));
  pdf.save();
  for (const wire of doc.wires) {
    const s = byId.get(wire.source);
    const t = byId.get(wire.target);
    const a = s ? portPosition(s, wire.sourcePort) : null;
    const c = t ? portPosition(t, wire.targetPort) : null;
    if (!a || !c) continue;
    const pa = map(a);
    const pc = map(c);
    pdf.lineWidth(0.7).strokeColor(COLORS.ink).moveTo(pa.x, pa.y).lineTo(pc.x, pa.y).lineTo(pc.x, pc.y).stroke();
  }
  for (const block of doc.blocks) drawBlock(pdf, block, map, k, des);
  pdf.restore();
  return (b.maxY - b.minY + 2 * pad) * k;
}

// ---------- plots ----------

const SCALES: Array<[number, string]> = [
  [1e9, 'G'],
  [1e6, 'M'],
  [1e3, 'k'],
  [1, ''],
  [1e-3, 'm'],
  [1e-6, 'µ'],
  [1e-9, 'n'],
];

function scaleFor(maxAbs: number): [number, string] {
  for (const s of SCALES) if (maxAbs >= s[0]) return s;
  return SCALES[SCALES.length - 1];
}

/** Tick values covering [lo, hi]: steps of 1, 2 or 5 × 10^n, about five of them. */
export function niceTicks(lo: number, hi: number, count = 5): number[] {
  if (!(hi > lo)) return [lo];
  const raw = (hi - lo) / count;
  const mag = 10 ** Math.floor(Math.log10(raw));
  const step = [1, 2, 5, 10].map((m) => m * mag).find((s) => s >= raw) as number;
  const out: number[] = [];
  for (let v = Math.ceil(lo / step) * step; v <= hi + step * 1e-9; v += step) out.push(Number(v.toPrecision(12)));
  return out;
}

function plot(pdf: Doc, series: Series, box: { x: number; y: number; w: number; h: number }, labels: { title: string; x: string; y: string; xUnit: string; yUnit: string }) {
  const { x, y, w, h } = box;
  const left = 48;
  const bottom = 26;
  const px = x + left;
  const pw = w - left - 8;
  const py = y + 14;
  const ph = h - bottom - 14;
  pdf.font('Helvetica-Bold').fontSize(8.5).fillColor(COLORS.ink).text(pdfText(labels.title), x, y, { width: w, lineBreak: false });
  const xs = series.x;
  const ys = series.y;
  const xLo = Math.min(...xs);
  let xHi = Math.max(...xs);
  let yLo = Math.min(...ys);
  let yHi = Math.max(...ys);
  if (xHi === xLo) xHi = xLo + 1;
  if (yHi === yLo) {
    yHi += Math.abs(yHi) * 0.01 || 1;
    yLo -= Math.abs(yLo) * 0.01 || 1;
  }
  const yPad = (yHi - yLo) * 0.05;
  yLo -= yPad;
  yHi += yPad;
  const [xs0, xp] = scaleFor(Math.max(Math.abs(xLo), Math.abs(xHi)));
  const [ys0, yp] = scaleFor(Math.max(Math.abs(yLo), Math.abs(yHi)));
  const X = (v: number) => px + ((v - xLo) / (xHi - xLo)) * pw;
  const Y = (v: number) => py + ph - ((v - yLo) / (yHi - yLo)) * ph;
  pdf.lineWidth(0.3).strokeColor(COLORS.grid);
  pdf.font('Helvetica').fontSize(6.5).fillColor(COLORS.muted);
  for (const t of niceTicks(xLo / xs0, xHi / xs0)) {
    const X0 = X(t * xs0);
    pdf.moveTo(X0, py).lineTo(X0, py + ph).stroke();
    const s = pdfText(String(Number(t.toPrecision(6))));
    pdf.text(s, X0 - pdf.widthOfString(s) / 2, py + ph + 3, { lineBreak: false });
  }
  for (const t of niceTicks(yLo / ys0, yHi / ys0)) {
    const Y0 = Y(t * ys0);
    pdf.moveTo(px, Y0).lineTo(px + pw, Y0).stroke();
    const s = pdfText(String(Number(t.toPrecision(6))));
    pdf.text(s, px - 4 - pdf.widthOfString(s), Y0 - 3, { lineBreak: false });
  }
  pdf.lineWidth(0.7).strokeColor(COLORS.ink).rect(px, py, pw, ph).stroke();
  const xText = pdfText(`${labels.x} (${xp}${labels.xUnit})`);
  pdf.fillColor(COLORS.ink).fontSize(7).text(xText, px + pw / 2 - pdf.widthOfString(xText) / 2, py + ph + 13, { lineBreak: false });
  const yText = pdfText(`${labels.y} (${yp}${labels.yUnit})`);
  pdf.save();
  pdf.rotate(-90, { origin: [x + 6, py + ph / 2] });
  pdf.text(yText, x + 6 - pdf.widthOfString(yText) / 2, py + ph / 2 - 3, { lineBreak: false });
  pdf.restore();
  pdf.save();
  pdf.rect(px, py, pw, ph).clip();
  pdf.lineWidth(1).strokeColor(COLORS.lagoon).moveTo(X(xs[0]), Y(ys[0]));
  for (let i = 1; i < xs.length; i++) pdf.lineTo(X(xs[i]), Y(ys[i]));
  pdf.stroke();
  pdf.restore();
}

// ---------- the report ----------

const CHECK_WORDS: Record<string, string> = { voltage: 'voltage', piv: 'PIV', averageCurrent: 'IF(AV)', peakCurrent: 'IF peak', power: 'power' };

function pctText(v: number | null): string {
  return v === null ? '—' : `${(v * 100).toFixed(1)} %`;
}

/** Draw the report of `model` (built by lib/exports/report.ts) for `doc`; resolves to the PDF bytes. */
export function renderReportPdf(model: ReportModel, doc: DesignDocument): Promise<Uint8Array> {
  const pdf = new PDFDocument({
    size: 'A4',
    margins: { top: PAGE.margin, bottom: PAGE.margin, left: PAGE.margin, right: PAGE.margin },
    info: { Title: pdfText(`${model.title.design} r${model.title.revision} design report`), Author: pdfText(model.title.author), Creator: 'Kilorung', Producer: 'Kilorung' },
    bufferPages: true,
  });
  const chunks: Buffer[] = [];
  pdf.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Uint8Array>((resolve, reject) => {
    pdf.on('end', () => resolve(new Uint8Array(Buffer.concat(chunks))));
    pdf.on('error', reject);
  });
  const w = new Writer(pdf);
  const t = model.title;

  // title block
  pdf.font('Helvetica-Bold').fontSize(17).fillColor(COLORS.ink).text(pdfText(t.design), w.left, w.y, { width: w.width });
  w.y = pdf.y + 2;
  w.para(`Design report · revision r${t.revision}`, { size: 10, color: COLORS.copper, bold: true });
  w.fields([
    ['Design', t.design],
    ['Team', t.team],
    ['Revision', `r${t.revision}${t.message ? ` — ${t.message}` : ''}`],
    ['Author', t.author],
    ['Date', fmtDate(t.date)],
    ['Topology', t.topology],
  ]);
  w.para(`Status: ${t.status}. Generated ${fmtDate(t.generatedAt)}. Parts judged at ${(model.derating.fraction * 100).toFixed(0)} % of their ratings (${model.derating.source === 'team' ? "the team's derating policy" : model.derating.source === 'design' ? "the design's own derating" : 'the default derating, common practice'}).`, { color: COLORS.muted, size: 8 });
  w.para('DANGER — HIGH VOLTAGE. This circuit stores a lethal charge. Read the safety section before building, testing or touching it.', { color: COLORS.hazard, bold: true, size: 9 });

  // drawing
  w.heading('Drawing');
  const drawH = 250;
  w.need(drawH);
  w.y += drawDocument(pdf, doc, model.designators, w.left, w.y, w.width, drawH) + 4;
  w.para('Designators: capacitors C, diodes D, resistors R, numbered from the bottom stage up, in column order (pumping, second pumping, smoothing; diodes A–D), then single parts.', { size: 7, color: COLORS.muted });

  // requirement vs result
  w.heading('Requirement vs result');
  if (model.solveFailure) w.para(`No results: ${model.solveFailure}. The tables below are empty for this revision; fix the drawing and save a new revision to get them.`, { color: COLORS.hazard, bold: true });
  const reqFmt = (v: number | null, unit: string) => (v === null ? '—' : unit === '%' ? pctText(v) : eng(v, unit));
  w.table(
    ['Figure', 'Required', 'Result', 'Verdict', 'Rule'],
    model.requirement.map((r) => [r.label, r.required === null ? 'not set' : reqFmt(r.required, r.unit), reqFmt(r.result, r.unit), r.pass === null ? '—' : r.pass ? 'PASS' : 'FAIL', r.rule]),
    [0.22, 0.16, 0.16, 0.1, 0.36],
    { rowColor: (i) => (model.requirement[i].pass === false ? COLORS.hazard : null) },
  );
  if (model.output) w.para(`Solved at ${eng(model.output.frequencyHz, 'Hz')}: output DC ${eng(model.output.dcV, 'V')}, ripple p-p ${eng(model.output.rippleV, 'V')}, load current ${eng(model.output.loadCurrentA, 'A')}.`, { size: 8 });

  // per-node table
  w.heading('Per-node readings');
  if (model.nodes.length === 0) w.para('No node readings (no solve).', { color: COLORS.muted });
  else w.table(['Node', 'Net', 'Mean V', 'Ripple p-p'], model.nodes.map((n) => [n.label, n.node, eng(n.meanV, 'V'), eng(n.rippleV, 'V')]), [0.42, 0.2, 0.19, 0.19]);

  // per-part table
  w.heading('Per-part stress');
  if (model.parts.length === 0) w.para('No part stress (no solve).', { color: COLORS.muted });
  else
    w.table(
      ['Designator', 'Part', 'Check', 'Stress', 'Rating', 'Derated limit', 'Margin', 'Status'],
      model.parts.map((p) => [p.designator, `${p.part}${p.partNumber !== 'unbound' ? ` (${p.partNumber})` : ''}`, CHECK_WORDS[p.check] ?? p.check, eng(p.actual, p.unit), p.rating === null ? 'unrated' : eng(p.rating, p.unit), p.allowed === null ? '—' : eng(p.allowed, p.unit), pctText(p.margin), p.status.toUpperCase()]),
      [0.1, 0.27, 0.09, 0.11, 0.11, 0.12, 0.1, 0.1],
      { rowColor: (i) => (model.parts[i].status === 'over' ? COLORS.hazard : null) },
    );

  // waveforms
  w.heading('Waveforms');
  if (model.waveform && model.waveform.x.length > 1) {
    w.need(170);
    plot(pdf, model.waveform, { x: w.left, y: w.y, w: w.width, h: 160 }, { title: `Output over one period, ${model.waveformLabel}`, x: 'Time in the period', y: 'Output', xUnit: 's', yUnit: 'V' });
    w.y += 168;
  } else w.para('No output waveform (no solve).', { color: COLORS.muted });
  if (model.warmup) {
    w.need(170);
    plot(pdf, model.warmup, { x: w.left, y: w.y, w: w.width, h: 160 }, { title: 'Warm-up: output (mean over each cycle) from power-on', x: 'Time from power-on', y: 'Output', xUnit: 's', yUnit: 'V' });
    w.y += 168;
    w.para(`90 % of the steady output after ${eng(model.warmup.t90S, 's')}, 99 % after ${eng(model.warmup.t99S, 's')}.`, { size: 8 });
  } else w.para('No warm-up curve (no solve, or the warm-up did not run within the budget).', { color: COLORS.muted });

  // safety
  w.heading('Safety');
  w.para(`Stored energy in all capacitors: ${eng(model.safety.totalEnergyJ, 'J')}. Bleeder across the output: ${model.safety.bleederOhm === null ? 'none fitted' : eng(model.safety.bleederOhm, 'Ω')}.`);
  if (model.safety.outputs.length > 0)
    w.table(
      ['Output', 'Voltage', 'Stack energy', 'Discharge path', 'Discharge to 60 V', 'Largest bleeder for 5 s'],
      model.safety.outputs.map((o) => [o.label, eng(o.voltageV, 'V'), eng(o.stackEnergyJ, 'J'), o.dischargeResistanceOhm === null ? 'NONE' : eng(o.dischargeResistanceOhm, 'Ω'), o.toSafeVoltageS === null ? 'never (no path)' : eng(o.toSafeVoltageS, 's'), eng(o.bleederFor5sOhm, 'Ω')]),
      [0.2, 0.14, 0.14, 0.16, 0.18, 0.18],
    );
  for (const warning of model.safety.warnings) w.para(`Warning: ${warning}`, { color: COLORS.hazard, size: 8 });
  w.para('Cautions', { bold: true });
  for (const c of model.safety.cautions) w.para(`• ${c}`, { size: 8.5 });

  // revision and approval record
  w.heading('Revision and approval record');
  w.para(`This report is of revision r${t.revision}, saved by ${t.author} on ${fmtDate(t.date)}.`);
  w.para(model.thisRevisionApproval ? `Revision r${t.revision} was approved by ${model.thisRevisionApproval.approvedBy} on ${fmtDate(model.thisRevisionApproval.approvedAt)}.` : `Revision r${t.revision}: not approved.`, { bold: true });
  if (model.approvals.length > 0) w.table(['Revision', 'Approved by', 'When', 'Note'], model.approvals.map((a) => [`r${a.revision}`, a.approvedBy, fmtDate(a.approvedAt), a.note]), [0.12, 0.25, 0.23, 0.4]);
  else w.para('The design has no approvals.', { color: COLORS.muted });
  w.para('An approval records that a colleague reviewed a revision. It is not a safety certificate.', { size: 8, color: COLORS.muted });

  // page footers
  const range = pdf.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    pdf.switchToPage(i);
    pdf.page.margins.bottom = 0;
    const footer = pdfText(`${t.design} · r${t.revision} · page ${i + 1} of ${range.count} · HIGH VOLTAGE — lethal stored charge`);
    pdf.font('Helvetica').fontSize(6.5).fillColor(COLORS.muted).text(footer, PAGE.margin, PAGE.height - PAGE.margin + 14, { width: PAGE.width - 2 * PAGE.margin, lineBreak: false });
  }
  pdf.end();
  return done;
}
