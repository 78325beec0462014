/**
 * One capture in the worker, through the same capture function the headless replay uses:
 * exact on vector pages (the drawn stroke itself), followed through the pixels on scans.
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
  const result = await captureTrace({ guides, method: request.method, extent: request.extent, frame: request.frame }, { kind: session.sheet.kind, lines: session.lines, raster: session.raster });
  return { points: result.points.map((p) => [p[0], p[1]] as XY), used: result.how === 'vector' ? 'vector' : 'raster', gaps: result.notes };
}
