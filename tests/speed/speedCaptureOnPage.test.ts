/**
 * The workbench's capture (src/ui/worker/captureOnPage.ts) and the headless replay choose the same
 * drawn path for every trace of an INVENTED vector speed sheet whose curves bunch (seed 2 of
 * scripts/randomSheets/speedSheet.ts: efficiency curves run together near zero flow), when the
 * workbench hands in the other traces' guides as the replay does; and a capture whose guides sit
 * where lines bunch and no other trace claims them returns its doubt as a sentence.
 */
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { loadPdfSheetNode } from '../../src/digitize/loaders/pdfNode.ts';
import type { Sheet } from '../../src/digitize/sheet.ts';
import { replayTakeoff, type ReplayResult } from '../../src/digitize/takeoff.ts';
import { strokeLines } from '../../src/digitize/vectorCapture.ts';
import { siblingGuides } from '../../src/digitize/vectorChoice.ts';
import { parseTakeoff, type Takeoff } from '../../src/model/takeoff.ts';
import { captureOnPage } from '../../src/ui/worker/captureOnPage.ts';
import type { PageSession } from '../../src/ui/worker/pageSession.ts';
import { makeSpeedSheet } from '../../scripts/randomSheets/speedSheet.ts';
import { hasChromium } from '../digitize/fixtures/browserSheet.ts';

describe.skipIf(!hasChromium)('workbench capture on a vector speed sheet whose curves bunch', () => {
  let sheet: Sheet;
  let session: PageSession;
  let takeoff: Takeoff;
  let replay: ReplayResult;
  beforeAll(async () => {
    const s = await makeSpeedSheet(2, { kind: 'vector', efficiencyAs: 'curves' });
    sheet = await loadPdfSheetNode(s.bytes);
    takeoff = parseTakeoff(s.takeoff);
    replay = await replayTakeoff(takeoff, sheet, { created: '2026-01-01T00:00:00.000Z' });
    const lines = sheet.paths().then((p) => strokeLines(p));
    session = { sheet, replaySheet: sheet, lines: () => lines, straights: () => Promise.resolve([]), raster: () => sheet.render(4), notes: [], close: () => sheet.close() };
  }, 60_000);
  afterAll(() => sheet?.close());

  const capture = (index: number, withSiblings: boolean) => {
    const t = takeoff.traces[index]!;
    const others = siblingGuides(takeoff.traces.filter((_, k) => k !== index)).map((g) => g.map((p): [number, number] => [p[0], p[1]]));
    const frame = takeoff.panels.find((p) => p.id === t.panel)?.frame;
    return captureOnPage(session, { guides: (t.guides ?? []).map(([x, y]) => [x, y]), method: t.method ?? 'auto', ...(t.extent ? { extent: t.extent } : {}), ...(frame ? { frame } : {}), ...(withSiblings ? { siblings: others } : {}) }, () => {});
  };

  it('takes the path the replay takes, trace for trace, with the other traces\' guides', async () => {
    let differsAlone = 0;
    for (const [index, t] of takeoff.traces.entries()) {
      if ((t.guides?.length ?? 0) === 0) continue;
      const replayed = replay.traces.find((o) => o.index === index)!;
      const got = await capture(index, true);
      expect(got.used, t.id).toBe('vector');
      expect(got.points, t.id).toEqual(replayed.points.map((p) => [p[0], p[1]]));
      const alone = await capture(index, false);
      if (JSON.stringify(alone.points) !== JSON.stringify(got.points)) differsAlone++;
    }
    // Without them, some capture in the bunch takes another path: the siblings are what settle it.
    expect(differsAlone).toBeGreaterThan(0);
  }, 60_000);

  it('returns a doubt as a sentence when another drawn line is as near and no trace claims it', async () => {
    const index = takeoff.traces.findIndex((t) => t.quantity === 'efficiency');
    const t = takeoff.traces[index]!;
    // One guide at the efficiency curves' common start, where they run together, and no siblings.
    const start = replay.traces.find((o) => o.index === index)!.points[1]!;
    const got = await captureOnPage(session, { guides: [[start[0], start[1]]], method: 'auto', ...(t.extent ? { extent: t.extent } : {}) }, () => {});
    expect(got.doubts.length).toBe(1);
    expect(got.doubts[0]).toMatch(/^(Another drawn line passes|\d+ other drawn lines pass) about as near its guides as the line taken.*\.$/);
  });
});
