/**
 * Reading a record PDF back as text, the way a reviewer selects and copies it: pdf.js (with every
 * warning it prints captured), poppler's pdftotext, and the list of figures the record shows that
 * such a check must find. Shared by the record tests and the browser tests.
 */
import { spawnSync } from 'node:child_process';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import type { Overlay } from '../../src/record/overlay.ts';
import type { StudyResult } from '../../src/study/runStudy.ts';
import { studyUnitSystem } from '../../src/study/resolve.ts';
import { studyView } from '../../src/study/view.ts';
import { formatNumber, parseUnit } from '../../src/units/index.ts';

export interface PdfText {
  pages: number;
  /** Text of each page, items joined by spaces. */
  pageText: string[];
  warnings: string[];
  sizes: [number, number][];
}

/** Opens the PDF in pdf.js (Node build), parses every page's operators and reads its text layer; captures what pdf.js logs. */
export async function pdfText(bytes: Uint8Array): Promise<PdfText> {
  const pdfjs = await import('pdfjs-dist/legacy/build/pdf.mjs');
  const root = dirname(createRequire(import.meta.url).resolve('pdfjs-dist/package.json'));
  const warnings: string[] = [];
  const log = console.log;
  const warn = console.warn;
  console.log = (...a: unknown[]) => warnings.push(a.join(' '));
  console.warn = (...a: unknown[]) => warnings.push(a.join(' '));
  try {
    const doc = await pdfjs.getDocument({ data: bytes.slice(), standardFontDataUrl: `${join(root, 'standard_fonts')}/`, verbosity: 1 }).promise;
    const pageText: string[] = [];
    const sizes: [number, number][] = [];
    for (let i = 1; i <= doc.numPages; i++) {
      const page = await doc.getPage(i);
      const vp = page.getViewport({ scale: 1 });
      sizes.push([vp.width, vp.height]);
      await page.getOperatorList(); // parses every drawing operator: broken content would warn here
      const tc = await page.getTextContent();
      pageText.push(tc.items.map((it) => ('str' in it ? it.str : '')).join(' '));
    }
    await doc.destroy();
    return { pages: doc.numPages, pageText, warnings, sizes };
  } finally {
    console.log = log;
    console.warn = warn;
  }
}

/** Whether poppler's pdftotext is on the PATH (poppler-utils; CI installs it). */
export const hasPdftotext = spawnSync('pdftotext', ['-v'], { encoding: 'utf8' }).error === undefined;

/** The text poppler extracts from a PDF file, one string per page (form feeds split the pages). */
export function popplerText(file: string): { pages: string[]; stderr: string; status: number | null } {
  const r = spawnSync('pdftotext', ['-enc', 'UTF-8', file, '-'], { encoding: 'utf8' });
  const pages = (r.stdout ?? '').split('\f');
  if (pages.length && pages[pages.length - 1]?.trim() === '') pages.pop();
  return { pages, stderr: r.stderr ?? '', status: r.status };
}

/** Runs of white space made one space, so that a figure wrapped onto the next line still matches. */
export const oneLine = (s: string) => s.replace(/\s+/g, ' ');

/**
 * The figures the record shows, as the text a check must find in it: per option its name, the
 * duty flow and head, both operating points ("250 m³/h at 43.67 m"), the shaft power at the duty
 * in its unit, the motor rating, NPSHa, NPSH3 and their ratio; and the values read on the sheet's
 * efficiency, power and NPSHr panels ("1: 35.77 kW").
 */
export function shownFigures(result: StudyResult, overlay: Overlay): string[] {
  const v = studyView(result, studyUnitSystem(result.study), { file: 'record' });
  const flow = parseUnit('flow', v.units.flow).label;
  const head = parseUnit('head', v.units.head).label;
  const npsh = parseUnit('head', v.units.npsh).label;
  const power = parseUnit('power', v.units.power).label;
  const out: string[] = [];
  for (const o of v.options) {
    out.push(o.name, `${formatNumber(o.flow as number, 4)} ${flow} at ${formatNumber(o.head as number, 4)} ${head}`);
    for (const op of [o.operating_points.low_static, o.operating_points.high_static]) if (op) out.push(`${formatNumber(op.flow as number, 4)} ${flow} at ${formatNumber(op.head as number, 4)} ${head}`);
    if (o.power !== null) out.push(`${formatNumber(o.power, 4)} ${power}`);
    if (o.motor_rating) out.push(o.motor_rating);
    if (o.npsha !== null && o.npsh3 !== null) out.push(`NPSHa ${formatNumber(o.npsha, 3)} ${npsh}, NPSH3 ${formatNumber(o.npsh3, 3)} ${npsh}`);
    if (o.npsh_margin_ratio !== null) out.push(`margin ratio NPSHa/NPSH3 ${o.npsh_margin_ratio.toFixed(2)}`);
  }
  for (const panel of overlay.panels) {
    for (const m of panel.marks) if (m.kind === 'reading' && m.inside) out.push(`${m.option + 1}: ${m.label.replace(/^.*: /, '')}`);
  }
  return out;
}
