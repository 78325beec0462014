/**
 * The pump's speed as the sheet prints it ("1450 rpm", "2950 r/min", "n = 1450 1/min"): read from
 * the text layer of a vector page (the workbench's sheet hints and the automatic take-off) or, on a scan, from the lines of
 * text above the top plot frame and below the bottom one (title, subtitle, footer), read by the
 * character reader. The speed sets the affinity law's reference and the specific speed, so a
 * speed taken for granted (the workbench's starting value) or mistyped is a wrong number with no
 * flag; a speed read from the sheet fills it in, and one that disagrees with the speed given is said.
 */
import type { RasterPanelsFound } from './rasterPanels.ts';
import { readCrops, type Blot, type TextReader } from './rasterText.ts';
import { SHEET_NUMBER, sheetNumber } from './words.ts';

/** Speeds outside this range (rpm) are not a pump's shaft speed but a model number or a year (common practice: centrifugal pumps run from a few hundred to some tens of thousands of rpm). */
const SPEED_RANGE = [100, 30000] as const;
/** A speed given that differs from the one printed by more than this share is said (common practice: a sheet rounds its speed to 1 rpm in 1000 or better, and 0.5 % of speed moves head by 1 %). */
export const SPEED_AGREE_SHARE = 0.005;
/** At most this many text lines are read beyond the frames: a title block, not a page of notes (our own limit, for the reading time). */
const MAX_LINES = 6;

const SPEED_TEXT = new RegExp(`${SHEET_NUMBER}\\s*(?:rpm|r\\s*/\\s*min|min\\s*-\\s*1|min⁻¹|1\\s*/\\s*min)(?![a-z])`, 'gi');

/** Every shaft speed a text prints ("1450 rpm", "2 950 r/min", "1450 1/min"), rpm, in order. */
export function speedsInText(text: string): number[] {
  const out: number[] = [];
  for (const m of text.matchAll(SPEED_TEXT)) {
    const v = sheetNumber(m[1] as string);
    if (v >= SPEED_RANGE[0] && v <= SPEED_RANGE[1]) out.push(v);
  }
  return out;
}

/** The one speed a text prints; undefined when it prints none, or two that differ. */
export function speedInText(text: string): number | undefined {
  const found = [...new Set(speedsInText(text))];
  return found.length === 1 ? found[0] : undefined;
}

/** The one speed a vector page's text prints (its items joined, since "1480" and "rpm" may be items of their own), with the item it stands in. */
export function speedOfTextItems(items: readonly string[]): SpeedRead | undefined {
  const rpm = speedInText(items.join(' \n '));
  if (rpm === undefined) return undefined;
  const item = items.find((t) => speedsInText(t).includes(rpm)) ?? items.find((t) => t.includes(String(rpm)));
  return { rpm, text: (item ?? `${rpm} rpm`).trim() };
}

/** True when a speed given differs from the speed the sheet prints by more than rounding. */
export function speedDisagrees(printed: number, given: number): boolean {
  return Math.abs(given - printed) > SPEED_AGREE_SHARE * printed;
}

/** The one sentence for a speed given that is not the speed the sheet prints. */
export function speedMismatchSentence(printed: SpeedRead, given: number): string {
  return `The sheet prints ${printed.rpm} rpm ("${printed.text}"), but the speed given is ${given} rpm; check the pump's speed before using the curve set (the affinity checks and specific speed rest on it).`;
}

export interface SpeedRead {
  rpm: number;
  /** The line it was read from, as read. */
  text: string;
}

/**
 * The speed printed on a scanned sheet: the text lines above the topmost frame and below the
 * lowest frame's flow title, read as words. Undefined when no line prints a speed, or the lines
 * print two different ones (then the engineer's speed stands, unchecked).
 */
export async function readSheetSpeed(found: RasterPanelsFound, reader: TextReader): Promise<SpeedRead | undefined> {
  const page = found.page;
  if (!page || found.frames.length === 0 || !(page.h > 0)) return undefined;
  const top = Math.min(...found.frames.map((f) => f[1]));
  const bottom = Math.max(...found.frames.map((f) => f[3]));
  // Below the lowest frame come its tick labels and its flow title (about 3.5 text heights); a footer lies beyond.
  const beyond = page.words.filter((w) => w.b < top - 0.5 * page.h || w.t > bottom + 3.5 * page.h);
  const lines: Blot[][] = [];
  for (const w of [...beyond].sort((a, b) => a.t + a.b - (b.t + b.b))) {
    const cy = (w.t + w.b) / 2;
    const line = lines.find((l) => Math.abs(((l[0] as Blot).t + (l[0] as Blot).b) / 2 - cy) < 0.6 * page.h);
    if (line) line.push(w);
    else lines.push([w]);
  }
  // The lines nearest the frames first: a title sits just above them, a footer just below.
  const near = lines
    .map((l) => ({ l, gap: Math.min(Math.abs(top - Math.max(...l.map((w) => w.b))), Math.abs(Math.min(...l.map((w) => w.t)) - bottom)) }))
    .sort((a, b) => a.gap - b.gap)
    .slice(0, MAX_LINES)
    .map((k) => k.l);
  if (near.length === 0) return undefined;
  const boxes = near.map((l) => ({ l: Math.min(...l.map((w) => w.l)) - 3, t: Math.min(...l.map((w) => w.t)) - 3, r: Math.max(...l.map((w) => w.r)) + 3, b: Math.max(...l.map((w) => w.b)) + 3 }));
  const readings = await readCrops(page.map, boxes.map((box) => ({ box, upright: false })), reader, 'words', 2 * page.strong);
  const speeds = readings.flatMap((r) => speedsInText(r.text).map((rpm) => ({ rpm, text: r.text.trim() })));
  const distinct = [...new Set(speeds.map((s) => s.rpm))];
  return distinct.length === 1 ? speeds[0] : undefined;
}
