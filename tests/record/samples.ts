/**
 * Shared fixtures for the selection-record tests: an invented sample sheet replayed from its
 * take-off, and an invented study of that pump (the curve set handed in from the replay).
 */
import { readFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { replayTakeoff, type ReplayResult } from '../../src/digitize/takeoff.ts';
import { parseTakeoff, type Takeoff } from '../../src/model/takeoff.ts';
import { parseStudy } from '../../src/model/study.ts';
import { runStudy, type StudyResult } from '../../src/study/runStudy.ts';
import type { MakeRecordInput } from '../../src/record/makeRecord.ts';
import type { Paper } from '../../src/record/recordPdf.ts';

export const SHEETS = resolve(import.meta.dirname, '../../samples/sheets');

/** Invented study for the invented IX-150 sheets (SI, 0–400 m³/h, 0–70 m). Four options, one of two pumps. */
export const SI_STUDY = {
  name: 'Invented record test: transfer to a tank (invented data)',
  units: 'si',
  liquid: { temperature: 20 },
  duty: { flow: 250 },
  suction: { surface_above_eye: [1, 2.5], pipes: [{ diameter: 202.7, length: 20, roughness: 0.045, k: 1 }] },
  discharge: { static_head: [30, 36], pipes: [{ diameter: 202.7, length: 300, roughness: 0.045, k: 6.5 }] },
  curveset: 'sheet.curveset.json',
  options: [
    { name: 'trimmed', impeller: 'trim' },
    { name: 'full impeller, throttled', impeller: 'drawn' },
    { name: 'variable speed', impeller: 'drawn', control: 'speed' },
    { name: 'two pumps, trimmed', impeller: 'trim', pumps: 2 },
  ],
  operation: { profile: [{ flow: 100, hours: 4000 }, { flow: 70, hours: 2000 }], tariff: 0.15 },
};

export interface Sample {
  takeoff: Takeoff;
  replay: ReplayResult;
  result: StudyResult;
  sheetBytes: Uint8Array;
  sheetName: string;
  sha256: string;
  kind: string;
  width: number;
  height: number;
}

const cache = new Map<string, Promise<Sample>>();

export function sample(name: string, study: unknown = SI_STUDY): Promise<Sample> {
  const key = `${name}:${JSON.stringify(study)}`;
  let p = cache.get(key);
  if (!p) {
    p = (async () => {
      const takeoff = parseTakeoff(JSON.parse(readFileSync(resolve(SHEETS, `${name}.takeoff.json`), 'utf8')));
      const path = resolve(SHEETS, takeoff.sheet);
      const sheet = await loadSheetFileNode(path, { page: takeoff.page });
      try {
        const replay = await replayTakeoff(takeoff, sheet, { created: '2026-01-01T00:00:00Z', sheetFile: takeoff.sheet });
        const result = runStudy(parseStudy(study), () => replay.curveSet);
        return { takeoff, replay, result, sheetBytes: new Uint8Array(readFileSync(path)), sheetName: takeoff.sheet, sha256: sheet.sha256, kind: sheet.kind, width: sheet.width, height: sheet.height };
      } finally {
        await sheet.close();
      }
    })();
    cache.set(key, p);
  }
  return p;
}

/** What `makeRecord` takes for a sample: its take-off, sheet, calibrations, curve set and study result. */
export function recordInput(name: string, s: Sample, paper: Paper, studyFile: string, created?: string): MakeRecordInput {
  return {
    takeoff: s.takeoff,
    takeoffName: `${name}.takeoff.json`,
    sheet: { bytes: s.sheetBytes, name: s.sheetName, sha256: s.sha256, page: 1, width: s.width, height: s.height },
    calibrations: s.replay.calibrations,
    curveSet: s.replay.curveSet,
    result: s.result,
    studyFile,
    paper,
    ...(created ? { created } : {}),
  };
}
