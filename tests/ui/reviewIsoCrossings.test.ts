/**
 * The review's iso-line residuals are read at the crossings the replay found
 * (`ReplayResult.crossings`), with the replay's tolerances, not found again with others: the
 * workbench and the CLI then agree on where an iso-line met each head curve. INVENTED committed
 * sample sheet.
 */
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { traceResiduals } from '../../src/ui/app/review.ts';
import { fromTakeoffFile } from '../../src/ui/store/takeoffFile.ts';

const DIR = join(import.meta.dirname, '..', '..', 'samples', 'sheets');

describe('iso-line residuals in the review', () => {
  it('are taken at the crossings the replay found, and at none when the replay found none', async () => {
    const raw = JSON.parse(readFileSync(join(DIR, 'us-iso-colour.takeoff.json'), 'utf8')) as { traces: { id: string }[] };
    const takeoff = parseTakeoff(raw);
    const sheet = await loadSheetFileNode(join(DIR, takeoff.sheet));
    const result = await replayTakeoff(takeoff, sheet, { created: '2024-01-01T00:00:00Z' }).finally(() => sheet.close());
    const captured = new Map(result.traces.map((o) => [o.id, o.points.map((p) => [p[0], p[1]])]));
    const draft = fromTakeoffFile({ ...raw, traces: raw.traces.map((t) => ({ ...t, captured: captured.get(t.id) })) }, { name: takeoff.sheet, kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 612, height: 792 });
    const isos = takeoff.traces.filter((t) => t.iso !== undefined).map((t) => t.id as string);
    expect(isos.length).toBeGreaterThan(0);

    const residuals = traceResiduals(draft, takeoff, result.curveSet, result.calibrations, result.traceMembers, result.crossings);
    for (const id of isos) {
      const crossings = result.crossings.get(id) ?? [];
      // One residual per crossing the replay found (a crossing outside the fitted flow range gives none).
      expect(residuals.get(id)?.points ?? 0, id).toBeLessThanOrEqual(crossings.length);
      if (crossings.length > 0) expect(residuals.get(id)?.points ?? 0, id).toBeGreaterThan(0);
    }
    expect(isos.some((id) => (residuals.get(id)?.points ?? 0) > 0)).toBe(true);

    // A replay that found no crossings gives no iso residuals; the curve traces keep theirs.
    const none = traceResiduals(draft, takeoff, result.curveSet, result.calibrations, result.traceMembers, new Map());
    for (const id of isos) expect(none.has(id), id).toBe(false);
    for (const t of takeoff.traces.filter((t) => t.iso === undefined && t.diameter !== undefined)) expect(none.get(t.id as string)?.points ?? 0, t.id).toBeGreaterThan(2);
  }, 60_000);
});
