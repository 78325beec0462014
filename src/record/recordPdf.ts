/**
 * The selection record as a PDF: page 1 is the maker's sheet (a PDF page embedded as it is, or
 * the scan embedded as an image) with the study drawn over it as vector paths; the pages after it
 * hold the ranked study table, the family chart with the system curves, the findings, the NPSH and
 * motor lines with their cautions, and the provenance. The caution stands at the foot of every page.
 * Options are told apart by line style (and colour), so the record reads in black and white.
 *
 * Pure: bytes in, bytes out (pdf-lib, standard fonts). The CLI and the workbench both call it.
 */
import { PDFDocument, StandardFonts, rgb, type PDFFont, type PDFPage, type RGB } from 'pdf-lib';
import type { Calibration } from '../digitize/calibration.ts';
import { UserError } from '../model/errors.ts';
import type { CurveSet } from '../model/curveset.ts';
import { MOTOR_CAUTION, NPSH_CAUTION, PRELIMINARY } from '../duty/cautions.ts';
import { pumpCurveOfMember } from '../duty/pumpCurve.ts';
import { systemHead } from '../duty/systemCurve.ts';
import type { StudyResult } from '../study/runStudy.ts';
import type { StudyView } from '../study/view.ts';
import { formatNumber, fromSI, niceLinearScale, parseUnit, type Unit } from '../units/index.ts';
import { TOOL_NAME, TOOL_VERSION } from '../version.ts';
import { ownCurve, type Overlay, type OverlayOption } from './overlay.ts';

export type Paper = 'a4' | 'letter';
/** Page sizes in PDF points (1/72 in): ISO 216 A4 210 × 297 mm; US Letter 8.5 × 11 in. */
export const PAPER: Record<Paper, readonly [number, number]> = { a4: [595.28, 841.89], letter: [612, 792] };

/** The one-line caution on every page (PRELIMINARY from duty/cautions.ts, shortened to the three points). */
export const RECORD_CAUTION = 'Preliminary engineering from digitised curves: verify against certified data and local codes; a licensed professional approves the selection.';

export interface RecordInput {
  sheet: { bytes: Uint8Array; name: string; sha256: string; page: number; width: number; height: number };
  takeoff: { name: string; date?: string };
  calibrations: ReadonlyMap<string, Calibration>;
  curveSet: CurveSet;
  result: StudyResult;
  view: StudyView;
  overlay: Overlay;
  paper?: Paper;
  /** Date written on the record (ISO 8601); the caller gives it so the bytes can be reproduced. */
  created?: string;
}

const MARGIN = 42;
const INK = rgb(0, 0, 0);
const GREY = rgb(0.45, 0.45, 0.45);

/** Characters the standard fonts (WinAnsi) lack, written out. */
const SPELL: Record<string, string> = { 'η': 'eta', '≥': '>=', '≤': '<=', '−': '-', '→': '->', '≈': '~', '√': 'sqrt', 'Δ': 'delta', 'ρ': 'rho', '₃': '3', '×': 'x', '⁻': '-', '¹': '1', '…': '...' };

/** A sheet the record cannot embed; the message says what to do. */
export class RecordError extends UserError {
  override name = 'RecordError';
  constructor(message: string) {
    super(message, 'record-sheet');
  }
}

/** Builds the record PDF. */
export async function recordPdf(input: RecordInput): Promise<Uint8Array> {
  const paper = PAPER[input.paper ?? 'a4'];
  const doc = await PDFDocument.create();
  const title = `Selection record: ${input.result.study.name ?? input.view.study.file}`;
  doc.setTitle(clean(title));
  doc.setCreator(`${TOOL_NAME} ${TOOL_VERSION}`);
  doc.setProducer(`${TOOL_NAME} ${TOOL_VERSION}`);
  if (input.created) {
    const d = new Date(input.created);
    if (!Number.isNaN(d.getTime())) {
      doc.setCreationDate(d);
      doc.setModificationDate(d);
    }
  }
  const regular = await doc.embedFont(StandardFonts.Helvetica);
  const bold = await doc.embedFont(StandardFonts.HelveticaBold);
  const w = new Writer(doc, paper, regular, bold, title);

  await sheetPage(w, input);
  tablePages(w, input);
  chartPage(w, input);
  findingsPages(w, input);
  npshMotorPages(w, input);
  provenancePages(w, input);
  w.finish();
  return doc.save();
}

/** Text the standard fonts can show: unknown characters are spelt out or replaced by "?". */
function clean(s: string, font?: PDFFont): string {
  const set = font ? new Set(font.getCharacterSet()) : undefined;
  let out = '';
  for (const ch of s) {
    const code = ch.codePointAt(0) as number;
    if (ch === '\n' || ch === '\t') out += ' ';
    else if (!set || set.has(code)) out += ch;
    else out += SPELL[ch] ?? '?';
  }
  return out;
}

/** A page-flowing writer: a cursor from the top, new pages when the space runs out, header and footer on each. */
class Writer {
  page!: PDFPage;
  y = 0;
  pages: PDFPage[] = [];
  constructor(
    readonly doc: PDFDocument,
    readonly size: readonly [number, number],
    readonly font: PDFFont,
    readonly bold: PDFFont,
    readonly title: string,
  ) {}
  get width() {
    return this.size[0] - 2 * MARGIN;
  }
  newPage(heading?: string) {
    this.page = this.doc.addPage([this.size[0], this.size[1]]);
    this.pages.push(this.page);
    this.y = this.size[1] - MARGIN;
    this.text(this.title, { size: 9, font: this.bold, colour: GREY });
    this.page.drawLine({ start: { x: MARGIN, y: this.y - 4 }, end: { x: this.size[0] - MARGIN, y: this.y - 4 }, thickness: 0.5, color: GREY });
    this.y -= 10;
    if (heading) this.heading(heading);
  }
  /** Space left above the footer. */
  get room() {
    return this.y - (MARGIN + 30);
  }
  need(h: number, heading?: string) {
    if (this.room < h) this.newPage(heading);
  }
  heading(s: string) {
    this.need(40);
    this.y -= 6;
    this.text(s, { size: 13, font: this.bold });
    this.y -= 4;
  }
  /** One line of text at the cursor, then moves down. */
  text(s: string, o: { size?: number; font?: PDFFont; colour?: RGB; x?: number } = {}) {
    const size = o.size ?? 9;
    const font = o.font ?? this.font;
    this.y -= size * 1.25;
    this.page.drawText(clean(s, font), { x: o.x ?? MARGIN, y: this.y, size, font, color: o.colour ?? INK });
  }
  /** A paragraph wrapped to the width, new pages as needed. */
  para(s: string, o: { size?: number; font?: PDFFont; indent?: number; colour?: RGB } = {}) {
    const size = o.size ?? 9;
    const font = o.font ?? this.font;
    const indent = o.indent ?? 0;
    for (const line of wrap(clean(s, font), font, size, this.width - indent)) {
      this.need(size * 1.3);
      this.text(line, { size, font, x: MARGIN + indent, ...(o.colour ? { colour: o.colour } : {}) });
    }
    this.y -= size * 0.4;
  }
  finish() {
    const n = this.pages.length;
    this.pages.forEach((p, i) => {
      const lines = wrap(RECORD_CAUTION, this.bold, 7.5, this.width - 60);
      lines.forEach((l, k) => p.drawText(l, { x: MARGIN, y: MARGIN + 8 - k * 9.5 + (lines.length - 1) * 9.5, size: 7.5, font: this.bold, color: INK }));
      p.drawLine({ start: { x: MARGIN, y: MARGIN + 8 + lines.length * 9.5 }, end: { x: this.size[0] - MARGIN, y: MARGIN + 8 + lines.length * 9.5 }, thickness: 0.5, color: GREY });
      const pg = `page ${i + 1} of ${n}`;
      p.drawText(pg, { x: this.size[0] - MARGIN - this.font.widthOfTextAtSize(pg, 7.5), y: MARGIN + 8, size: 7.5, font: this.font, color: GREY });
    });
  }
}

function wrap(s: string, font: PDFFont, size: number, width: number): string[] {
  const words = s.split(/\s+/).filter(Boolean);
  const lines: string[] = [];
  let line = '';
  for (const word of words) {
    const next = line ? `${line} ${word}` : word;
    if (line && font.widthOfTextAtSize(next, size) > width) {
      lines.push(line);
      line = word;
    } else line = next;
  }
  if (line) lines.push(line);
  return lines.length ? lines : [''];
}

const colourOf = (o: OverlayOption) => rgb(o.colour[0], o.colour[1], o.colour[2]);

/** A polyline in top-down page coordinates (origin top-left, y down, as drawSvgPath reads them at y = page height) stroked in the option's style. */
function stroke(page: PDFPage, pts: readonly (readonly [number, number])[], o: OverlayOption, width: number) {
  if (pts.length < 2) return;
  const h = page.getHeight();
  const d = pts.map((p, i) => `${i ? 'L' : 'M'}${p[0].toFixed(3)} ${p[1].toFixed(3)}`).join(' ');
  page.drawSvgPath(d, { x: 0, y: h, borderColor: colourOf(o), borderWidth: width, ...(o.style.dash.length ? { borderDashArray: [...o.style.dash] } : {}) });
}

/** Marker shapes by kind (shape, not colour, tells them apart). */
function marker(page: PDFPage, kind: string, x: number, y: number, o: OverlayOption, label: string, font: PDFFont, dy = 0) {
  const c = colourOf(o);
  if (kind === 'duty') {
    page.drawLine({ start: { x: x - 4, y: y - 4 }, end: { x: x + 4, y: y + 4 }, thickness: 1.1, color: c });
    page.drawLine({ start: { x: x - 4, y: y + 4 }, end: { x: x + 4, y: y - 4 }, thickness: 1.1, color: c });
  } else if (kind === 'operating-high') page.drawCircle({ x, y, size: 2.8, color: c, borderColor: INK, borderWidth: 0.4 });
  else if (kind === 'operating-low') page.drawCircle({ x, y, size: 2.8, borderColor: c, borderWidth: 1 });
  else page.drawSquare({ x: x - 2.5, y: y - 2.5, size: 5, color: rgb(1, 1, 1), borderColor: c, borderWidth: 1 });
  if (label) {
    // Black on a white patch: the sheet's own lines do not strike the figure through, and it reads in grey print.
    const size = 6.5;
    const tw = font.widthOfTextAtSize(label, size);
    page.drawRectangle({ x: x + 3.2, y: y + 1.6 - dy, width: tw + 1.6, height: size + 0.4, color: rgb(1, 1, 1), opacity: 0.85 });
    page.drawText(label, { x: x + 4, y: y + 3 - dy, size, font, color: INK });
  }
}

async function sheetPage(w: Writer, input: RecordInput) {
  w.newPage();
  w.heading('The sheet with the study drawn on it');
  const { sheet, overlay } = input;
  const legendRows = overlay.options.length + 3;
  const availW = w.width;
  const availH = w.room - legendRows * 11 - 24;
  const s = Math.min(availW / sheet.width, availH / sheet.height);
  const ox = MARGIN + (availW - s * sheet.width) / 2;
  const top = w.y - 4;
  const pageH = w.size[1];
  const at = (p: readonly [number, number]) => [ox + s * p[0], pageH - (top - s * p[1])] as const; // top-down page coordinates
  const isPdf = sheet.bytes[0] === 0x25 && sheet.bytes[1] === 0x50 && sheet.bytes[2] === 0x44 && sheet.bytes[3] === 0x46;
  if (isPdf) {
    const src = await PDFDocument.load(sheet.bytes, { ignoreEncryption: false, updateMetadata: false });
    const page = src.getPage(sheet.page - 1);
    const [embedded] = await w.doc.embedPdf(src, [sheet.page - 1]);
    if (!embedded) throw new RecordError(`The sheet "${sheet.name}" has no page ${sheet.page}.`);
    const box = page.getCropBox();
    const sx = (s * sheet.width) / box.width;
    w.page.drawPage(embedded, { x: ox, y: top - s * sheet.height, xScale: sx, yScale: (s * sheet.height) / box.height });
  } else {
    const png = sheet.bytes[0] === 0x89 && sheet.bytes[1] === 0x50;
    const jpg = sheet.bytes[0] === 0xff && sheet.bytes[1] === 0xd8;
    if (!png && !jpg) throw new RecordError(`The sheet "${sheet.name}" is neither a PDF nor a PNG or JPEG image; the record cannot embed it.`);
    const img = png ? await w.doc.embedPng(sheet.bytes) : await w.doc.embedJpg(sheet.bytes);
    w.page.drawImage(img, { x: ox, y: top - s * sheet.height, width: s * sheet.width, height: s * sheet.height });
  }
  w.page.drawRectangle({ x: ox, y: top - s * sheet.height, width: s * sheet.width, height: s * sheet.height, borderColor: GREY, borderWidth: 0.5 });
  const lw = Math.max(0.9, 1.4 * Math.min(1, s * 1.6));
  for (const panel of overlay.panels) {
    for (const path of panel.paths) {
      const o = overlay.options[path.option] as OverlayOption;
      const width = path.kind === 'por' ? lw * 3.2 : path.kind === 'system-low' ? lw * 0.8 : lw;
      for (const line of path.lines) {
        if (path.kind === 'por') {
          // The POR band: a wide pale stroke under the curve.
          const h = w.page.getHeight();
          const d = line.map((p, i) => { const q = at(p); return `${i ? 'L' : 'M'}${q[0].toFixed(3)} ${q[1].toFixed(3)}`; }).join(' ');
          w.page.drawSvgPath(d, { x: 0, y: h, borderColor: colourOf(o), borderWidth: width, borderOpacity: 0.28 });
        } else stroke(w.page, line.map(at), o, width);
      }
    }
    const placed: [number, number][] = [];
    // Top to bottom, so that labels pushed down to clear each other keep the order of their marks.
    for (const m of [...panel.marks].sort((a, b) => a.at[1] - b.at[1])) {
      if (!m.inside) continue;
      const o = overlay.options[m.option] as OverlayOption;
      const q = at(m.at);
      const label = m.kind === 'reading' ? clean(`${m.option + 1}: ${m.label.replace(/^.*: /, '')}`, w.font) : String(m.option + 1);
      const shown = m.kind === 'duty' || m.kind === 'operating-low' ? '' : label;
      // Labels of marks at the same place stack downwards instead of overprinting.
      let dy = 0;
      if (shown) {
        while (placed.some((p) => Math.abs(p[0] - q[0]) < 30 && Math.abs(p[1] - (q[1] + dy)) < 7)) dy += 7;
        placed.push([q[0], q[1] + dy]);
      }
      marker(w.page, m.kind, q[0], w.page.getHeight() - q[1], o, shown, w.font, dy);
    }
  }
  w.y = top - s * sheet.height - 8;
  legend(w, input, SHEET_LEGEND);
  for (const n of overlay.notes) w.para(n, { size: 8 });
}

const MARKS_LEGEND = 'filled circle = operating point at the high static head; open circle = at the low static head; cross = duty point';
const SHEET_LEGEND = `Legend: ${MARKS_LEGEND}; square = value read at the duty flow, labelled with the option\u2019s number. The thinner line is the system at the low static head; the wide pale band is the POR on the option\u2019s own curve (trimmed impeller or reduced speed). Several pumps in parallel: the system is drawn against the flow of one pump.`;
const CHART_LEGEND = `Legend: ${MARKS_LEGEND}. The thinner line is the system at the low static head; the option\u2019s own curve (trimmed impeller or reduced speed) is drawn in its style. Several pumps in parallel: the system is drawn against the flow of one pump.`;

function legend(w: Writer, input: RecordInput, text: string) {
  const { overlay } = input;
  w.para(text, { size: 7.5 });
  for (const o of overlay.options) {
    w.need(12);
    w.y -= 11;
    const x0 = MARGIN;
    const h = w.page.getHeight();
    stroke(w.page, [[x0, h - (w.y + 3)], [x0 + 46, h - (w.y + 3)]], o, 1.4);
    const r = input.result.ranked[o.index];
    const fail = r && r.findings.some((f) => f.severity === 'fail') ? ' (FAILS a check)' : '';
    w.page.drawText(clean(`${o.index + 1}. ${o.name} \u2014 ${o.style.name}${fail}${o.drawn ? '' : ' (not drawn: another pump)'}`, w.font), { x: x0 + 54, y: w.y, size: 8.5, font: w.font, color: INK });
  }
  w.y -= 6;
}

/** Columns of the study table: header, the text of a row, right-aligned? */
function tablePages(w: Writer, input: RecordInput) {
  const v = input.view;
  const u = v.units;
  const lab = (kind: 'flow' | 'head' | 'power' | 'diameter', token: string) => parseUnit(kind, token).label;
  w.newPage('Study and ranking');
  w.para(`Study: ${v.study.name ?? v.study.file}`, { font: w.bold });
  w.para(`Units: flow ${lab('flow', u.flow)}, head and NPSH ${lab('head', u.head)}, power ${lab('power', u.power)}, impeller ${lab('diameter', u.diameter)}. Flow and power are totals of all pumps at the duty; head, efficiency, NPSH and motor are per pump.`, { size: 8.5 });
  w.para(`Result: ${v.why}`);
  const f = (x: number | null | undefined, d = 4) => (x === null || x === undefined || !Number.isFinite(x) ? '-' : formatNumber(x, d));
  const cols: { h: string; unit: string; w: number; cell: (o: StudyView['options'][number]) => string }[] = [
    { h: '#', unit: '', w: 14, cell: (o) => String(o.rank) },
    { h: 'option', unit: '', w: 108, cell: (o) => o.name },
    { h: 'pumps', unit: '', w: 32, cell: (o) => `${o.pumps}${o.control === 'speed' ? ' VS' : ''}` },
    { h: 'impeller', unit: lab('diameter', u.diameter), w: 38, cell: (o) => f(o.diameter) },
    { h: 'speed', unit: 'rpm', w: 30, cell: (o) => (o.speed === null ? '-' : String(Math.round(o.speed))) },
    { h: 'flow', unit: lab('flow', u.flow), w: 34, cell: (o) => f(o.flow) },
    { h: 'head', unit: lab('head', u.head), w: 32, cell: (o) => f(o.head) },
    { h: 'eff', unit: '%', w: 26, cell: (o) => f(o.efficiency, 3) },
    { h: 'power', unit: lab('power', u.power), w: 34, cell: (o) => f(o.power) },
    { h: 'motor', unit: '', w: 44, cell: (o) => o.motor_rating ?? '-' },
    { h: 'NPSHa/', unit: 'NPSH3', w: 36, cell: (o) => (o.npsh_margin_ratio === null ? '-' : o.npsh_margin_ratio.toFixed(2)) },
    { h: 'energy', unit: 'kWh/yr', w: 40, cell: (o) => (o.annual_energy_kwh === null ? '-' : String(Math.round(o.annual_energy_kwh))) },
    { h: 'LCC', unit: '', w: 40, cell: (o) => (o.life_cycle_cost === null ? '-' : String(Math.round(o.life_cycle_cost))) },
    { h: 'result', unit: '', w: 30, cell: (o) => (o.result === 'fail' ? 'FAIL' : 'ok') },
  ];
  const total = cols.reduce((a, c) => a + c.w, 0);
  const k = w.width / total;
  const size = 7.5;
  const row = (cells: string[], font: PDFFont) => {
    w.need(12);
    w.y -= 11;
    let x = MARGIN;
    cells.forEach((c, i) => {
      const cw = (cols[i] as (typeof cols)[number]).w * k;
      let t = clean(c, font);
      while (t.length > 1 && font.widthOfTextAtSize(t, size) > cw - 3) t = t.slice(0, -1);
      const tw = font.widthOfTextAtSize(t, size);
      w.page.drawText(t, { x: i === 1 ? x : x + cw - 3 - tw, y: w.y, size, font, color: INK });
      x += cw;
    });
  };
  w.y -= 4;
  row(cols.map((c) => c.h), w.bold);
  row(cols.map((c) => c.unit), w.font);
  w.page.drawLine({ start: { x: MARGIN, y: w.y - 3 }, end: { x: MARGIN + w.width, y: w.y - 3 }, thickness: 0.5, color: INK });
  for (const o of v.options) row(cols.map((c) => c.cell(o)), w.font);
  w.y -= 10;
  for (const o of v.options) {
    const op = o.operating_points;
    w.para(`${o.rank}. ${o.name}: operating point at the low static head ${op.low_static ? `${f(op.low_static.flow)} ${lab('flow', u.flow)} at ${f(op.low_static.head)} ${lab('head', u.head)}` : 'none'}; at the high static head ${op.high_static ? `${f(op.high_static.flow)} ${lab('flow', u.flow)} at ${f(op.high_static.head)} ${lab('head', u.head)}` : 'none'}; duty ${f(o.flow)} ${lab('flow', u.flow)} at ${f(o.head)} ${lab('head', u.head)} (system ${f(o.system_head)} ${lab('head', u.head)}).`, { size: 8.5 });
  }
  for (const n of v.notes) w.para(`Note: ${n}`, { size: 8, colour: GREY });
}

/** The family chart: the curve set's head curves, each option's system curves and operating points, in the study's units. */
function chartPage(w: Writer, input: RecordInput) {
  const set = input.curveSet;
  const { overlay, result, view } = input;
  const flowU: Unit = parseUnit('flow', view.units.flow);
  const headU: Unit = parseUnit('head', view.units.head);
  w.newPage('Family chart with the system curves');
  const rho = set.fluid.density_kg_m3;
  const curves = set.members.map((m) => ({ m, c: pumpCurveOfMember(m, rho, rho) }));
  let qMax = Math.max(...curves.map((x) => x.c.domain[1]));
  let hMax = Math.max(...curves.map((x) => x.c.head(x.c.domain[0])));
  for (const r of result.ranked) {
    for (const op of [r.operating_points.low, r.operating_points.high]) if (op) qMax = Math.max(qMax, op.flow_m3s / r.pumps);
    hMax = Math.max(hMax, r.duty?.system_head_m ?? 0);
  }
  const h = Math.min(w.room - 152, w.width * 0.8);
  const left = MARGIN + 40;
  const right = MARGIN + w.width - 10;
  const topY = w.y - 22; // room for the axis title above the frame
  const bottomY = topY - h;
  const xs = niceLinearScale(0, fromSI(qMax * 1.05, flowU), [left, right], 8);
  const ys = niceLinearScale(0, fromSI(hMax * 1.1, headU), [bottomY, topY], 8);
  const p = w.page;
  for (const t of xs.tickValues) {
    const x = xs.map(t);
    p.drawLine({ start: { x, y: bottomY }, end: { x, y: topY }, thickness: 0.3, color: rgb(0.8, 0.8, 0.8) });
    const s = formatNumber(t, 4);
    p.drawText(s, { x: x - w.font.widthOfTextAtSize(s, 7) / 2, y: bottomY - 10, size: 7, font: w.font, color: INK });
  }
  for (const t of ys.tickValues) {
    const y = ys.map(t);
    p.drawLine({ start: { x: left, y }, end: { x: right, y }, thickness: 0.3, color: rgb(0.8, 0.8, 0.8) });
    const s = formatNumber(t, 4);
    p.drawText(s, { x: left - 4 - w.font.widthOfTextAtSize(s, 7), y: y - 2.5, size: 7, font: w.font, color: INK });
  }
  p.drawRectangle({ x: left, y: bottomY, width: right - left, height: topY - bottomY, borderColor: INK, borderWidth: 0.7 });
  p.drawText(clean(`flow of one pump [${flowU.label}]`, w.font), { x: (left + right) / 2 - 40, y: bottomY - 22, size: 8, font: w.font });
  p.drawText(clean(`head [${headU.label}]`, w.font), { x: MARGIN - 2, y: topY + 11, size: 8, font: w.font });
  const inPlot = (q: number, hh: number) => [xs.map(fromSI(q, flowU)), ys.map(fromSI(hh, headU))] as const;
  const clipY = (pt: readonly [number, number]) => pt[1] >= bottomY - 0.01 && pt[1] <= topY + 0.01 && pt[0] <= right + 0.01;
  const pageH = p.getHeight();
  const path = (pts: (readonly [number, number])[]) => {
    const keep = pts.filter(clipY);
    return keep.map((q, i) => `${i ? 'L' : 'M'}${q[0].toFixed(2)} ${(pageH - q[1]).toFixed(2)}`).join(' ');
  };
  for (const { m, c } of curves) {
    const pts = Array.from({ length: 81 }, (_, i) => c.domain[0] + ((c.domain[1] - c.domain[0]) * i) / 80).map((q) => inPlot(q, c.head(q)));
    const d = path(pts);
    if (d) p.drawSvgPath(d, { x: 0, y: pageH, borderColor: INK, borderWidth: 0.8 });
    const end = pts[pts.length - 1];
    const diaU = parseUnit('diameter', view.units.diameter);
    const dia = clean(m.diameter_m !== undefined ? `${formatNumber(fromSI(m.diameter_m, diaU), 4)} ${diaU.label}` : `${m.speed_rpm} rpm`, w.font);
    if (end && clipY(end)) p.drawText(dia, { x: end[0] + 2, y: end[1] - 2, size: 6.5, font: w.font, color: INK });
  }
  for (const o of overlay.options) {
    const r = result.ranked[o.index];
    if (!r) continue;
    const qs = Array.from({ length: 81 }, (_, i) => (qMax * 1.05 * i) / 80);
    for (const [sys, width] of [[r.systems.high, 1.3], [r.systems.low, 0.8]] as const) {
      const d = path(qs.map((q) => inPlot(q, systemHead(sys, q * r.pumps))));
      if (d) p.drawSvgPath(d, { x: 0, y: pageH, borderColor: colourOf(o), borderWidth: width, ...(o.style.dash.length ? { borderDashArray: [...o.style.dash] } : {}) });
    }
    const own = ownCurve(r);
    if (own) {
      const d = path(Array.from({ length: 81 }, (_, i) => own.domain[0] + ((own.domain[1] - own.domain[0]) * i) / 80).map((q) => inPlot(q, own.head(q))));
      if (d) p.drawSvgPath(d, { x: 0, y: pageH, borderColor: colourOf(o), borderWidth: 1, ...(o.style.dash.length ? { borderDashArray: [...o.style.dash] } : {}) });
    }
    for (const [key, kind] of [['low', 'operating-low'], ['high', 'operating-high']] as const) {
      const op = r.operating_points[key];
      if (!op) continue;
      const q = inPlot(op.flow_m3s / r.pumps, op.head_m);
      if (clipY(q)) marker(p, kind, q[0], q[1], o, kind === 'operating-high' ? String(o.index + 1) : '', w.font);
    }
    if (r.duty) {
      const q = inPlot(r.duty.flow_m3s / r.pumps, r.duty.system_head_m);
      if (clipY(q)) marker(p, 'duty', q[0], q[1], o, '', w.font);
    }
  }
  w.y = bottomY - 30;
  legend(w, input, CHART_LEGEND);
  w.para('Black lines: the curve set\u2019s head curves at rated speed, labelled with the impeller diameter. Drawn in the study\u2019s units from the fitted curves, not from the sheet.', { size: 8 });
}

function findingsPages(w: Writer, input: RecordInput) {
  w.newPage('Findings');
  const set = input.curveSet;
  w.para(`Checks of the curve set (${set.pump.name ?? 'pump'}${set.members[0] ? `, ${set.members[0].speed_rpm} rpm` : ''}):`, { font: w.bold });
  if (set.findings.length === 0) w.para('No findings.');
  for (const f of set.findings) w.para(`${f.severity.toUpperCase()}  ${f.message}`, { size: 8.5, indent: 8 });
  for (const o of input.view.options) {
    w.para(`Option ${o.rank}, ${o.name}:`, { font: w.bold });
    if (o.findings.length === 0) w.para('No findings.', { indent: 8 });
    for (const f of o.findings) w.para(f.replace(/^(fail|warn|note): /, (_m, s: string) => `${s.toUpperCase()}  `), { size: 8.5, indent: 8 });
  }
}

function npshMotorPages(w: Writer, input: RecordInput) {
  w.newPage('NPSH and motor');
  const v = input.view;
  const head = parseUnit('head', v.units.npsh).label;
  const flow = parseUnit('flow', v.units.flow).label;
  const power = parseUnit('power', v.units.power).label;
  const f = (x: number | null | undefined, d = 3) => (x === null || x === undefined || !Number.isFinite(x) ? 'not available' : formatNumber(x, d));
  for (const o of v.options) {
    w.para(`${o.rank}. ${o.name}`, { font: w.bold });
    w.para(`NPSH at the duty: NPSHa ${f(o.npsha)} ${head}, NPSH3 ${f(o.npsh3)} ${head}, margin ratio NPSHa/NPSH3 ${o.npsh_margin_ratio === null ? 'not available' : o.npsh_margin_ratio.toFixed(2)}.`, { indent: 8 });
    if (o.run_out) w.para(`At run-out ${f(o.run_out.flow, 4)} ${flow}: NPSHa ${f(o.run_out.npsha)} ${head}, NPSH3 ${f(o.run_out.npsh3)} ${head}, margin ratio NPSHa/NPSH3 ${o.run_out.npsh_margin_ratio.toFixed(2)} (${o.run_out.basis}).`, { indent: 8 });
    if (o.max_eye_elevation !== null) w.para(`Highest impeller eye above the lowest suction level: ${f(o.max_eye_elevation)} ${head}.`, { indent: 8 });
    if (o.velocity_head_check) w.para(o.velocity_head_check, { indent: 8, size: 8.5 });
    const r = input.result.ranked[o.rank - 1];
    const motor = r?.motor;
    if (motor) {
      w.para(`Motor: ${o.motor_rating ?? 'none large enough'}, sized for ${f(o.motor_sizing_power, 4)} ${power} (non-overloading to the end of the curve at ${f(fromSI(motor.peak_flow_m3s, parseUnit('flow', v.units.flow)), 4)} ${flow}); shaft power at the duty ${f(o.power, 4)} ${power} in total.`, { indent: 8 });
      for (const n of motor.selection.notes) w.para(n, { indent: 16, size: 8 });
    } else w.para('Motor: no size can be given (no power or efficiency curve).', { indent: 8 });
  }
  w.para(`Caution (NPSH): ${NPSH_CAUTION}`, { font: w.bold, size: 8.5 });
  w.para(`Caution (motor): ${MOTOR_CAUTION}`, { font: w.bold, size: 8.5 });
}

/** A residual to three significant figures; below 0.001 it is written as such (exact anchors leave rounding noise). */
function small(v: number): string {
  return Math.abs(v) < 0.001 ? 'below 0.001' : formatNumber(v, 3);
}

function provenancePages(w: Writer, input: RecordInput) {
  w.newPage('Provenance');
  const { sheet, takeoff, curveSet } = input;
  w.para(`Sheet: ${sheet.name}, page ${sheet.page}`);
  w.para(`Sheet SHA-256: ${sheet.sha256}`, { size: 8 });
  w.para(`Take-off: ${takeoff.name}${takeoff.date ? `, dated ${takeoff.date}` : ''}; curve set replayed ${curveSet.provenance.created}.`);
  w.para('Calibration of each panel (anchor residuals):', { font: w.bold });
  for (const [id, cal] of input.calibrations) {
    w.para(`${id}: ${cal.method} fit, ${cal.residuals.length} anchors, rms ${small(cal.rmsSheet)} and largest ${small(cal.maxSheet)} sheet units, largest ${small(cal.maxPercentOfSpan)} % of span${cal.warnings.length ? ` (${cal.warnings.join(' ')})` : ''}.`, { indent: 8, size: 8.5 });
  }
  w.para(`Study: ${input.view.study.file}. Made by ${TOOL_NAME} ${TOOL_VERSION}${input.created ? ` on ${input.created}` : ''}.`);
  w.para(`Caution: ${PRELIMINARY}`, { font: w.bold, size: 8.5 });
  for (const c of input.result.cautions.filter((c) => c !== PRELIMINARY && c !== NPSH_CAUTION && c !== MOTOR_CAUTION)) w.para(`Caution: ${c}`, { size: 8.5 });
}
