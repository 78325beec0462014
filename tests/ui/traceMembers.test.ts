/**
 * The replay hands out the trace ↔ member link it made, and the review reads it instead of
 * comparing diameters: every curve trace of an INVENTED committed sample sheet maps to the one
 * member of its diameter, every iso-trace to the members of the head curves it crosses, and the
 * review's residuals and fitted lines follow that link.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { fitLinesOnSheet, traceResiduals, tracesOfMember } from '../../src/ui/app/review.ts';
import { fromTakeoffFile } from '../../src/ui/store/takeoffFile.ts';
import { parseUnit, toSI } from '../../src/units/index.ts';

const DIR = join(import.meta.dirname, '..', '..', 'samples', 'sheets');

async function replaySample(name: string) {
  const raw = JSON.parse(readFileSync(join(DIR, `${name}.takeoff.json`), 'utf8')) as unknown;
  const takeoff = parseTakeoff(raw);
  const sheet = await loadSheetFileNode(join(DIR, takeoff.sheet));
  try {
    return { raw, takeoff, result: await replayTakeoff(takeoff, sheet, { created: '2024-01-01T00:00:00Z' }) };
  } finally {
    await sheet.close();
  }
}

describe('the trace ↔ member link from the replay', () => {
  it('links each curve trace to the member of its diameter and each iso-trace to the members it crossed', async () => {
    const { takeoff, result } = await replaySample('us-iso-colour');
    const { curveSet, traceMembers } = result;
    const inch = parseUnit('diameter', takeoff.units.diameter);
    let curves = 0;
    let isos = 0;
    for (const [index, trace] of takeoff.traces.entries()) {
      const id = trace.id ?? String(index + 1);
      const members = traceMembers.get(id) ?? [];
      if (trace.iso === undefined && trace.diameter !== undefined) {
        curves++;
        expect(members, id).toHaveLength(1);
        // The one place a diameter is compared: the test, against the take-off's own number (1e-12 relative).
        expect(curveSet.members[members[0]!]!.diameter_m! / toSI(trace.diameter, inch), id).toBeCloseTo(1, 12);
      } else if (trace.iso !== undefined) {
        isos++;
        expect(members.length, id).toBeGreaterThan(0);
        for (const m of members) expect(m).toBeLessThan(curveSet.members.length);
      }
    }
    expect(curves).toBeGreaterThan(3);
    expect(isos).toBeGreaterThan(0);
    // The inverse: every member is fed by at least its head trace.
    for (let m = 0; m < curveSet.members.length; m++) expect(tracesOfMember(traceMembers, m).length, `member ${m}`).toBeGreaterThan(0);
  }, 60_000);

  it('the review\'s residuals and fitted lines follow the link', async () => {
    const { raw, takeoff, result } = await replaySample('us-iso-colour');
    // The workbench keeps each trace's captured points in the draft, as the replay found them.
    const captured = new Map(result.traces.map((o) => [o.id, o.points.map((p) => [p[0], p[1]])]));
    const withPoints = { ...(raw as { traces: { id: string }[] }), traces: (raw as { traces: { id: string }[] }).traces.map((t) => ({ ...t, captured: captured.get(t.id) })) };
    const draft = fromTakeoffFile(withPoints, { name: takeoff.sheet, kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 612, height: 792 });
    const residuals = traceResiduals(draft, takeoff, result.curveSet, result.calibrations, result.traceMembers);
    const curveTraces = takeoff.traces.filter((t) => t.iso === undefined && t.diameter !== undefined);
    for (const t of curveTraces) expect(residuals.get(t.id as string)?.points ?? 0, t.id).toBeGreaterThan(2);
    const lines = fitLinesOnSheet(takeoff, result.curveSet, result.calibrations, result.traceMembers);
    expect(lines.length).toBe(new Set(curveTraces.map((t) => `${t.panel}|${t.quantity}|${t.diameter}`)).size);
    // Without the link nothing is matched, rather than a guess by diameter.
    expect(traceResiduals(draft, takeoff, result.curveSet, result.calibrations, new Map()).size).toBe(0);
  }, 60_000);
});
