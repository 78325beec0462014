/**
 * One capture in the worker, through the same capture function the headless replay uses:
 * exact on vector pages (the drawn stroke itself), followed through the pixels on scans. The other
 * traces' guides come with the request, as the replay passes them, and the capture's doubts go back.
 */
import { sheetPoint } from '../../digitize/points.ts';
import { captureTrace } from '../../digitize/capture.ts';
import type { Progress } from './rpc.ts';
import type { CaptureAnswer, CaptureRequest, XY } from './protocol.ts';
import type { PageSession } from './pageSession.ts';

export async function captureOnPage(session: PageSession, request: CaptureRequest, progress: (p: Progress) => void): Promise<CaptureAnswer> {
  const guides = request.guides.map((g) => sheetPoint(g[0], g[1]));
  const vector = session.sheet.kind === 'vector-pdf' && request.method !== 'raster';
  progress({ fraction: null, label: vector ? 'Finding the drawn line' : 'Following the line through the picture' });
  // The other traces' guides, as the headless replay hands them in, so that both choose the same path in a bunch.
  const siblings = (request.siblings ?? []).map((g) => g.map((p) => sheetPoint(p[0], p[1])));
  const companions = (request.companions ?? []).map((g) => g.map((p) => sheetPoint(p[0], p[1])));
  const result = await captureTrace({ guides, method: request.method, extent: request.extent, frame: request.frame, siblings, companions }, { kind: session.sheet.kind, lines: session.lines, raster: session.raster });
  const doubts = (result.doubts ?? []).map((d) => `${d.message[0]?.toUpperCase() ?? ''}${d.message.slice(1)}.`);
  return { points: result.points.map((p) => [p[0], p[1]] as XY), used: result.how === 'vector' ? 'vector' : 'raster', gaps: result.notes, doubts, moved: result.moved ?? [] };
}
