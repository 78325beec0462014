/**
 * Speed families drawn by the independent renderer (scripts/randomSheets/speedSheet.ts): one
 * INVENTED impeller at four speeds, as a vector PDF printed by Chromium and as a scan, taken off
 * as a hurried person takes it (labelled by speed) and scored against the exact affinity-scaled
 * family with the random bed's own scorer. It prints, per kind and quantity, the worst error of
 * each curve over 15–95 % of its flow range (% of span; efficiency in points), the share
 * flagged, wrong (beyond 1 % of span, 1.5 points of efficiency from curves or 2 from iso-lines, or missing) and wrong but not flagged.
 *
 *   SPEED_SHEETS=10 SPEED_SEED=1 npm run bench -- speedSheets
 *
 * SPEED_GUIDES=careful places every scan trace's guides where its line stands alone instead
 * (carefulGuides, as the random bed's careful view): what the tracer does when the person did
 * their part. SPEED_MONO=1 draws every speed in one colour. Per-trace reasons: scripts/randomSheets/speedDump.ts.
 * Sheets are drawn once and kept in artifacts/speed-sheets/ (the dump's cache), so a second run
 * measures only the take-off.
 */
import { writeFileSync } from 'node:fs';
import { scoreReplay, type CurveScore } from '../scripts/randomSheets/score.ts';
import { benchOptions, cachedSpeedSheet, sheetOf, withCarefulGuides } from '../scripts/randomSheets/speedDump.ts';
import { speedTruthSource, type SpeedSheet } from '../scripts/randomSheets/speedSheet.ts';
import { replayTakeoff } from '../src/digitize/takeoff.ts';
import type { CurveSet } from '../src/model/curveset.ts';
import { parseTakeoff } from '../src/model/takeoff.ts';

async function replay(s: SpeedSheet): Promise<CurveSet | { refused: string }> {
  const sheet = await sheetOf(s);
  try {
    return (await replayTakeoff(parseTakeoff(s.takeoff), sheet, { created: '2026-01-01T00:00:00.000Z' })).curveSet;
  } catch (error) {
    return { refused: (error as Error).message };
  } finally {
    await sheet.close();
  }
}

const quantile = (values: number[], p: number): number => {
  const s = [...values].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.floor(p * (s.length - 1) + 0.5))] as number;
};
const fmt = (v: number) => (Number.isFinite(v) ? v.toPrecision(3) : 'missing');
const pct = (n: number, of: number) => `${((100 * n) / Math.max(1, of)).toFixed(1)} %`;

export default async function bench(): Promise<void> {
  const count = Number(process.env.SPEED_SHEETS ?? 10);
  const first = Number(process.env.SPEED_SEED ?? 1);
  const monochrome = process.env.SPEED_MONO === '1';
  const careful = process.env.SPEED_GUIDES === 'careful';
  const rows: (CurveScore & { seed: number; kind: string })[] = [];
  for (let seed = first; seed < first + count; seed++) {
    for (const kind of ['vector', 'scan'] as const) {
      const drawn = await cachedSpeedSheet(seed, benchOptions(seed, kind));
      const s = careful ? withCarefulGuides(drawn) : drawn;
      const set = await replay(s);
      for (const r of scoreReplay(s.family, s.truth, set, speedTruthSource(s.family))) rows.push({ ...r, seed, kind });
    }
  }
  const lines = [`${count} speed sheets from seed ${first}${monochrome ? ' in one colour' : ''}, each as vector PDF and as scan${careful ? ', guides placed carefully' : ''}`, 'group                      curves   p50      p95      max      flagged  wrong    wrong+unflagged'];
  const groups = new Map<string, typeof rows>();
  for (const r of rows) {
    const key = `${r.kind}/${r.quantity}${r.source === 'iso' ? ' (iso)' : ''}`;
    groups.set(key, [...(groups.get(key) ?? []), r]);
  }
  for (const [key, list] of [...groups].sort()) {
    const errors = list.map((r) => r.error);
    lines.push(`${key.padEnd(26)} ${String(list.length).padStart(6)}   ${fmt(quantile(errors, 0.5)).padEnd(8)} ${fmt(quantile(errors, 0.95)).padEnd(8)} ${fmt(Math.max(...errors)).padEnd(8)} ${pct(list.filter((r) => r.flagged).length, list.length).padEnd(8)} ${pct(list.filter((r) => r.wrong).length, list.length).padEnd(8)} ${pct(list.filter((r) => r.wrong && !r.flagged).length, list.length)}`);
  }
  const wu = rows.filter((r) => r.wrong && !r.flagged);
  lines.push(`all curves: ${rows.length}; flagged ${pct(rows.filter((r) => r.flagged).length, rows.length)}; wrong ${pct(rows.filter((r) => r.wrong).length, rows.length)}; WRONG AND UNFLAGGED ${pct(wu.length, rows.length)} (${wu.length})`);
  if (wu.length) lines.push(`wrong-and-unflagged: ${wu.map((r) => `${r.seed}/${r.kind} ${r.id} ${fmt(r.error)}`).join('; ')}`);
  process.stdout.write(`${lines.join('\n')}\n`);
  // SPEED_DUMP=file.json keeps every row (seed, kind, curve, error, flags) for reading cases one by one.
  if (process.env.SPEED_DUMP) writeFileSync(process.env.SPEED_DUMP, `${JSON.stringify(rows, null, 1)}\n`);
}
