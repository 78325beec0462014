/**
 * One capture in the worker: guides → points, exactly on vector pages (the drawn stroke
 * itself), by following the line through the pixels on scans.
 */
import { sheetPoint } from '../../digitize/points.ts';
import { captureVector } from '../../digitize/vectorCapture.ts';
import { traceRaster } from '../../digitize/rasterTrace.ts';
import type { Progress } from './rpc.ts';
import type { CaptureAnswer, CaptureRequest, XY } from './protocol.ts';
import type { PageSession } from './pageSession.ts';

export async function captureOnPage(session: PageSession, request: CaptureRequest, progress: (p: Progress) => void): Promise<CaptureAnswer> {
  const guides = request.guides.map((g) => sheetPoint(g[0], g[1]));
  const vector = request.method === 'vector' || (request.method === 'auto' && session.sheet.kind === 'vector-pdf');
  if (vector) {
    progress({ fraction: null, label: 'Finding the drawn line' });
    const result = captureVector(await session.lines(), guides);
    return { points: result.points.map((p) => [p[0], p[1]] as XY), used: 'vector', gaps: [] };
  }
  progress({ fraction: null, label: 'Following the line through the picture' });
  const result = traceRaster(await session.raster(), guides);
  const gaps = result.lost.map((l) => `Between guides ${l.between[0]} and ${l.between[1]} the line was lost near (${l.at[0].toFixed(0)}, ${l.at[1].toFixed(0)}): ${l.reason}.`);
  return { points: result.points.map((p) => [p[0], p[1]] as XY), used: 'raster', gaps };
}
