/**
 * The review of a sheet drawn for one impeller at several speeds: the fitted curves drawn back on
 * the sheet, the residuals per trace and the chart's labels name each curve by its speed, never
 * by a diameter. The take-off is the one the workbench kept of the INVENTED speed sheet of
 * tests/e2e/speedSheet.test.ts (fixtures/autosave-v2-speed-sheet.json: four head curves at
 * 100/90/80/70 % of 1750 rpm), replayed on its captured points.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import type { Sheet } from '../../src/digitize/sheet.ts';
import { replayTakeoff, type ReplayResult } from '../../src/digitize/takeoff.ts';
import { parseTakeoff, type Takeoff } from '../../src/model/takeoff.ts';
import { fitLinesOnSheet, traceResiduals } from '../../src/ui/app/review.ts';
import { migrateSaved } from '../../src/ui/persist/records.ts';
import type { Draft } from '../../src/ui/store/draft.ts';
import { toTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { chartUnits, memberName } from '../../src/ui/views/familyChart.ts';
import { curveLabelText, speedWithShare } from '../../src/ui/views/words.ts';
import { spreadLabels } from '../../src/ui/geometry/labels.ts';

/** The replay reads the captured points only (`useCaptured`); a sheet that is asked for its lines fails the test. */
function sheetNotNeeded(sha256: string): Sheet {
  const refuse = () => Promise.reject(new Error('the replay should use the captured points'));
  return { kind: 'vector-pdf', width: 490, height: 791, sha256, page: 1, render: refuse, paths: refuse, text: refuse, close: async () => undefined } as unknown as Sheet;
}

let draft: Draft;
let takeoff: Takeoff;
let replay: ReplayResult;

beforeAll(async () => {
  const raw = JSON.parse(readFileSync(join(import.meta.dirname, 'fixtures', 'autosave-v2-speed-sheet.json'), 'utf8')) as unknown;
  draft = migrateSaved(raw, () => 'unused')!.draft;
  takeoff = parseTakeoff(toTakeoffFile(draft).takeoff);
  replay = await replayTakeoff(takeoff, sheetNotNeeded(takeoff.sheet_sha256 ?? ''), { useCaptured: true, created: '2026-01-01T00:00:00Z' });
});

describe('the review of a speed family', () => {
  it('is a speed family of four speeds', () => {
    expect(replay.curveSet.family).toBe('speed');
    expect(replay.curveSet.members.map((m) => m.speed_rpm).sort((a, b) => b - a)).toEqual([1750, 1575, 1400, 1225]);
  });

  it('draws every fitted head curve back on the sheet, labelled by its speed and its share of the rated speed', () => {
    const lines = fitLinesOnSheet(takeoff, replay.curveSet, replay.calibrations, replay.traceMembers);
    expect(lines.map((l) => l.label)).toEqual(['1750 rpm (100 %)', '1575 rpm (90 %)', '1400 rpm (80 %)', '1225 rpm (70 %)']);
    expect(lines.every((l) => l.points.length > 50 && l.quantity === 'head')).toBe(true);
    expect(lines.some((l) => /mm/.test(l.label))).toBe(false);
  });

  it('gives every speed trace its residuals against its own fitted curve', () => {
    const residuals = traceResiduals(draft, takeoff, replay.curveSet, replay.calibrations, replay.traceMembers);
    for (const t of takeoff.traces) {
      const r = residuals.get(t.id as string);
      expect(r?.points ?? 0, t.id).toBeGreaterThan(50);
      // Vector capture of a smooth drawn curve: the fit stays within 0.5 % of the curve's span (reading accuracy, common practice).
      expect(r!.percentOfSpan, t.id).toBeLessThan(0.5);
    }
  });

  it('labels the chart\'s curves by speed, and by diameter only on a sheet of diameters', () => {
    const set = replay.curveSet;
    const u = chartUnits(set);
    const fastest = set.members.find((m) => m.speed_rpm === 1750)!;
    expect(memberName(set, fastest, u)).toBe('1750 rpm');
    expect(memberName(set, set.members.find((m) => m.speed_rpm === 1575)!, u, true)).toBe('1575 rpm (90 %)');
    // A speed family whose members all carry the one impeller diameter is still named by speed.
    expect(memberName(set, { ...fastest, diameter_m: 0.25 }, u)).toBe('1750 rpm');
    expect(memberName({ family: 'diameter', speed_rpm: 1450 }, { ...fastest, diameter_m: 0.25 }, u)).toBe('250 mm');
  });

  it('words a label the same everywhere', () => {
    expect(curveLabelText({ speed: 1450 }, 'mm')).toBe('1450 rpm');
    expect(curveLabelText({ speed: 1305 }, 'mm', 1450)).toBe('1305 rpm (90 %)');
    expect(curveLabelText({ diameter: 12.5 }, 'in')).toBe('12.5 in');
    expect(speedWithShare(2610, 2900)).toBe('2610 rpm (90 %)');
  });
});

describe('labels at curve ends', () => {
  it('that would overlap are moved apart; labels side by side keep their place', () => {
    // The efficiency curves of a speed family end 30 px apart at about the same height.
    const bunched = [1750, 1575, 1400, 1225].map((n, k) => ({ x: 300 - 30 * k, y: 40 + 0.5 * k, text: `${n} rpm` }));
    const spread = spreadLabels(bunched, 11, 6.2);
    const width = (l: { text: string }) => 6.2 * l.text.length;
    for (const a of spread) {
      for (const b of spread) {
        if (a === b) continue;
        const apart = a.x >= b.x + width(b) || b.x >= a.x + width(a) || Math.abs(a.y - b.y) >= 11;
        expect(apart, `${a.text} and ${b.text}`).toBe(true);
      }
    }
    expect(new Set(spread.map((l) => l.y)).size).toBeGreaterThan(1);
    const apart = [{ x: 0, y: 40, text: '1750 rpm' }, { x: 200, y: 41, text: '1575 rpm' }];
    expect(spreadLabels(apart, 11).map((l) => l.y)).toEqual([40, 41]);
  });
});
