/**
 * One entry point for the selection record, called by the `report` command and the workbench:
 * the study's view in its own units, the overlay through the take-off's calibrations, the PDF.
 * Pure: everything arrives loaded.
 */
import type { Calibration } from '../digitize/calibration.ts';
import type { CurveSet } from '../model/curveset.ts';
import type { Takeoff } from '../model/takeoff.ts';
import type { OptionResult } from '../study/evaluate.ts';
import { studyUnitSystem } from '../study/resolve.ts';
import type { StudyResult } from '../study/runStudy.ts';
import { studyView } from '../study/view.ts';
import { buildOverlay, type Overlay } from './overlay.ts';
import { recordPdf, type Paper } from './recordPdf.ts';

export interface MakeRecordInput {
  takeoff: Takeoff;
  takeoffName: string;
  takeoffDate?: string;
  sheet: { bytes: Uint8Array; name: string; sha256: string; page: number; width: number; height: number };
  calibrations: ReadonlyMap<string, Calibration>;
  /** The curve set replayed from the take-off (the pump on the sheet). */
  curveSet: CurveSet;
  result: StudyResult;
  studyFile: string;
  /** Which options are of the pump on the sheet; default: all. */
  onSheet?: (r: OptionResult) => boolean;
  paper?: Paper;
  created?: string;
}

export interface MadeRecord {
  pdf: Uint8Array;
  overlay: Overlay;
}

/** Whether two curve sets describe the same pump at the same speed (names, maker, model, size and rated speed). */
export function samePump(a: CurveSet, b: CurveSet): boolean {
  const key = (s: CurveSet) => JSON.stringify([s.pump.name ?? null, s.pump.maker ?? null, s.pump.model ?? null, s.pump.size ?? null, [...new Set(s.members.map((m) => m.speed_rpm))].sort()]);
  return key(a) === key(b);
}

export async function makeRecord(i: MakeRecordInput): Promise<MadeRecord> {
  const overlay = buildOverlay(i.takeoff, i.calibrations, i.result, i.onSheet ? { onSheet: i.onSheet } : {});
  const view = studyView(i.result, studyUnitSystem(i.result.study), { file: i.studyFile });
  const pdf = await recordPdf({
    sheet: i.sheet,
    takeoff: { name: i.takeoffName, ...(i.takeoffDate ? { date: i.takeoffDate } : {}) },
    calibrations: i.calibrations,
    curveSet: i.curveSet,
    result: i.result,
    view,
    overlay,
    ...(i.paper ? { paper: i.paper } : {}),
    ...(i.created ? { created: i.created } : {}),
  });
  return { pdf, overlay };
}
