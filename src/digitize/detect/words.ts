/**
 * What the words of a sheet say: which quantity an axis title names and in which unit, which
 * titles name the flow axis, and which short texts label a curve (an impeller diameter such as
 * "330 mm", 13 in or 12.5", a speed such as "1450 rpm") or an iso-line ("75 %"). Pure text
 * rules; where the words sit is for the callers. The workbench's sheet hints read the same rules.
 */
import type { Quantity } from '../../model/curveset.ts';

/** A number as sheets print it: 1,450 or 1 450 or 12.5 or 12,5. */
export const SHEET_NUMBER = String.raw`(\d{1,3}(?:[ ,]\d{3})+|\d+(?:[.,]\d+)?)`;

/** The value of a number as printed (thousands separators dropped, a decimal comma read as a point). */
export function sheetNumber(text: string): number {
  return Number(text.replace(/[ ,](?=\d{3}\b)/g, '').replace(',', '.'));
}

/** True when a title names the flow axis (flow, capacity, Q), not a plotted quantity. */
export function isFlowTitle(text: string): boolean {
  return /\bflow\b|\bcapacity\b|^\s*Q\b|\bQ\s*[([]/i.test(text) && !/npsh|power|effic|head/i.test(text);
}

/** What a title says a panel plots, or null. */
export function quantityOfTitle(text: string): Quantity | null {
  if (isFlowTitle(text)) return null;
  if (/npsh/i.test(text)) return 'npshr';
  if (/power|\bbhp\b|\bkW\b|\bhp\b/i.test(text)) return 'power';
  if (/effic|\beff\b|η/i.test(text)) return 'efficiency';
  if (/head|\bTDH\b|H\s*\(/i.test(text)) return 'head';
  // A long title word read with a letter or two lost or changed (on a scan the "ffi" of
  // "Efficiency" often prints as one glyph and is read as "f" or "fi").
  for (const word of text.toLowerCase().match(/[a-z]+/g) ?? []) {
    for (const [name, quantity] of MISREAD_TITLE_WORDS) if (word.length >= name.length - 2 && editDistance(word, name) <= 2) return quantity;
  }
  return null;
}

/** Title words long enough to be told apart with two letters misread. */
const MISREAD_TITLE_WORDS: ReadonlyArray<readonly [string, Quantity]> = [['efficiency', 'efficiency']];

/** Least number of single-letter insertions, deletions and substitutions turning `a` into `b` (Levenshtein). */
export function editDistance(a: string, b: string): number {
  let previous = Array.from({ length: b.length + 1 }, (_, j) => j);
  for (let i = 1; i <= a.length; i++) {
    const current = [i];
    for (let j = 1; j <= b.length; j++) current[j] = Math.min((previous[j] as number) + 1, (current[j - 1] as number) + 1, (previous[j - 1] as number) + (a[i - 1] === b[j - 1] ? 0 : 1));
    previous = current;
  }
  return previous[b.length] as number;
}

/** The unit a title names in brackets ("Head (ft)" → "ft", "Flow Q [m³/h]" → "m³/h"), or null. */
export function unitOfTitle(text: string): string | null {
  const all = [...text.matchAll(/[([]\s*([^()[\]]+?)\s*[)\]]/g)];
  const last = all.at(-1);
  return last ? (last[1] as string) : null;
}

export interface CurveLabel {
  kind: 'diameter' | 'speed';
  value: number;
  /** 'mm' or 'in' for a diameter, 'rpm' for a speed. */
  unit: 'mm' | 'in' | 'rpm';
}

/** A diameter or speed label ("Ø330 mm", "13 in", "12.5\"", "1450 rpm"), or null. */
export function curveLabel(text: string): CurveLabel | null {
  const t = text.trim();
  const d = new RegExp(`^(?:Ø|⌀|D\\s*=?)?\\s*${SHEET_NUMBER}\\s*(mm|in|")$`, 'i').exec(t);
  if (d) {
    const value = sheetNumber(d[1] as string);
    return value > 0 ? { kind: 'diameter', value, unit: (d[2] as string).toLowerCase() === 'mm' ? 'mm' : 'in' } : null;
  }
  const s = new RegExp(`^(?:n\\s*=?\\s*)?${SHEET_NUMBER}\\s*(?:rpm|r/min|min-1|min⁻¹|1/min)$`, 'i').exec(t);
  if (s) {
    const value = sheetNumber(s[1] as string);
    return value >= 100 && value <= 30000 ? { kind: 'speed', value, unit: 'rpm' } : null;
  }
  return null;
}

/**
 * A word read on a scan without the specks the reader takes for marks before or after it (a
 * comma, a dash, a stroke: the stub of the line the label is printed on). An inch mark stays.
 */
export function trimSpecks(text: string): string {
  return text.replace(/^[\s,.;:_\-–—'`~|]+|[\s,.;:_\-–—'`~|]+$/g, '');
}

/** True when a text names a minimum-continuous-flow line ("min. flow", "minimum flow", "Qmin", "min. continuous flow"). */
export function minFlowLabel(text: string): boolean {
  return /^(?:min(?:imum)?\.?\s*(?:cont(?:inuous|\.)?\s*)?flow|q\s*_?\s*min|mcf)\.?$/i.test(text.trim());
}

/** The share of rated speed a speed label prints ("90 %", "n = 90 %", "90 % n"), 20–120 %, or null. Whether a "%" label names a speed or an iso level is for its place on the sheet to say (labels.ts speedShares). */
export function speedShareLabel(text: string): number | null {
  const m = /^(?:n\s*=?\s*)?(\d{2,3}(?:[.,]\d+)?)\s*%(?:\s*n)?$/i.exec(text.trim());
  if (!m) return null;
  const v = sheetNumber(m[1] as string);
  return v >= 20 && v <= 120 ? v : null;
}

/** The level of an iso-efficiency label ("75%", "75 %", "η 75 %"), or null. */
export function isoLabel(text: string): number | null {
  const m = /^(?:η\s*=?\s*)?(\d{1,2}(?:[.,]\d+)?)\s*%$/.exec(text.trim());
  return m ? sheetNumber(m[1] as string) : null;
}
