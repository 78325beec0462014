/**
 * Keeps what follows from the draft up to date: each panel's calibration (at once, on the
 * main thread: it is a few small sums), and the curve set (in the worker, a moment after
 * the last edit, through the headless replay's own code).
 */
import { borrowPerspective, calibrate, panelCalibrateOptions } from '../../digitize/calibration.ts';
import type { PanelDraft, Draft } from '../store/draft.ts';
import { anchorsWithValues } from '../store/draft.ts';
import { toTakeoffFile } from '../store/takeoffFile.ts';
import type { SheetWorkerClient } from '../worker/client.ts';
import type { CalibrationState, Derived } from './bench.ts';
import { fitLinesOnSheet, traceResiduals } from './review.ts';

export const EMPTY_DERIVED: Derived = {
  calibrations: new Map(),
  takeoff: null,
  curveSet: null,
  problem: null,
  omitted: [],
  residuals: new Map(),
  fits: [],
  traceMembers: new Map(),
  computing: false,
};

export function calibrationOf(panel: PanelDraft): CalibrationState {
  const anchors = anchorsWithValues(panel);
  try {
    return { ok: true, calibration: calibrate(anchors, panelCalibrateOptions(panel)) };
  } catch (error) {
    const missing = panel.anchors.length - anchors.length;
    const reason = missing > 0 ? `Type ${missing === 1 ? 'the value of 1 anchor' : `the values of ${missing} anchors`} to set this panel's axes.` : (error as Error).message;
    return { ok: false, reason };
  }
}

export class DerivedState {
  current: Derived = EMPTY_DERIVED;
  private panelMemo = new WeakMap<PanelDraft, CalibrationState>();
  private timer: number | undefined;
  private serial = 0;

  constructor(
    private readonly worker: SheetWorkerClient,
    private readonly changed: () => void,
    private readonly names: () => { sheetFile: string; takeoffName: string },
  ) {}

  /** Recomputes calibrations now and schedules the curve set; `ready` says whether the worker has the page. */
  update(draft: Draft, ready: boolean): void {
    const calibrations = new Map<string, CalibrationState>();
    for (const p of draft.panels) {
      let c = this.panelMemo.get(p);
      if (!c) {
        c = calibrationOf(p);
        this.panelMemo.set(p, c);
      }
      calibrations.set(p.id, c);
    }
    // The page's perspective, lent to panels whose anchors cannot reveal it (as the replay does).
    const lent = borrowPerspective(draft.panels.map((p) => {
      const c = calibrations.get(p.id);
      return { id: p.id, anchors: anchorsWithValues(p), options: panelCalibrateOptions(p), calibration: c?.ok ? c.calibration : undefined };
    }));
    for (const [id, calibration] of lent) calibrations.set(id, { ok: true, calibration });
    this.current = { ...this.current, calibrations };
    window.clearTimeout(this.timer);
    if (!ready) return;
    let takeoff;
    let omitted: string[] = [];
    try {
      ({ takeoff, omitted } = toTakeoffFile(draft));
    } catch (error) {
      this.current = { ...this.current, takeoff: null, curveSet: null, problem: (error as Error).message, omitted: [], residuals: new Map(), fits: [], traceMembers: new Map(), computing: false };
      return;
    }
    const serial = ++this.serial;
    this.current = { ...this.current, takeoff, omitted, computing: true };
    this.timer = window.setTimeout(async () => {
      try {
        const { curveSet, traceMembers, crossings } = await this.worker.call('replay', { takeoff, ...this.names() });
        if (serial !== this.serial) return;
        const cals = new Map([...calibrations].flatMap(([id, c]) => (c.ok ? [[id, c.calibration] as const] : [])));
        this.current = {
          ...this.current,
          curveSet,
          problem: null,
          residuals: traceResiduals(draft, takeoff, curveSet, cals, traceMembers, crossings),
          fits: fitLinesOnSheet(takeoff, curveSet, cals, traceMembers),
          traceMembers,
          computing: false,
        };
      } catch (error) {
        if (serial !== this.serial) return;
        this.current = { ...this.current, curveSet: null, problem: (error as Error).message, residuals: new Map(), fits: [], traceMembers: new Map(), computing: false };
      }
      this.changed();
    }, 250);
  }
}
