/**
 * The automatic take-off of a scan (an image, or a PDF page that is one picture): panels and
 * their calibrations from the ink and the tick labels read (rasterPanels.ts). Curves are not
 * found on scans yet: the engineer's traces (guides) in the take-off are kept and replayed on
 * the found panels, and a take-off without traces is refused with a sentence saying so.
 *
 * Pure: the sheet and the character reader are handed in.
 */
import { TakeoffError, parseTakeoff, type TakeoffToDetect } from '../../model/takeoff.ts';
import { safeScale, type Sheet } from '../sheet.ts';
import type { DetectedTakeoff, Detection } from './detect.ts';
import { takeoffPanels } from './detect.ts';
import { findRasterPanels, type DetectProgress } from './rasterPanels.ts';
import type { TextReader } from './rasterText.ts';

export const RASTER_DETECTOR = 'pumpscribe detect 1 (scans: panels only)';

/** A PDF page that is a scan is rendered at 300 dpi (within the pixel limit). */
const PDF_SCAN_SCALE = 300 / 72;

export async function detectRasterTakeoff(input: TakeoffToDetect, raw: Record<string, unknown>, sheet: Sheet, reader: TextReader, progress?: DetectProgress): Promise<DetectedTakeoff> {
  const image = await sheet.render(sheet.kind === 'image' ? 1 : safeScale(sheet, PDF_SCAN_SCALE));
  const found = await findRasterPanels(image, reader, progress);
  const questions = [...found.questions];
  const userPanels = (input.panels ?? []).filter((p) => p.origin !== 'detected');
  const { panels } = takeoffPanels(found.panels, userPanels, input.units, questions);
  const detection: Detection = { panels: found.panels, curves: [], labelled: [], family: 'diameter', labelUnit: null, droppedProposals: 0, questions: found.questions };
  const named = panels.filter((p) => p.origin === 'detected').map((p) => p.id);
  const all = (input.traces ?? []).filter((t) => t.origin !== 'detected');
  // A trace on a panel neither given nor found waits, with a question, rather than failing the rest.
  const orphans = all.filter((t) => !panels.some((p) => p.id === t.panel));
  const traces = all.filter((t) => !orphans.includes(t));
  if (orphans.length > 0) {
    const names = [...new Set(orphans.map((t) => t.panel))];
    questions.push(`The panel${names.length === 1 ? '' : 's'} ${names.map((n) => `"${n}"`).join(', ')} of the trace${orphans.length === 1 ? '' : 's'} ${orphans.map((t) => `"${t.id}"`).join(', ')} ${names.length === 1 ? 'was' : 'were'} not found on this scan (found: ${named.join(', ') || 'none'}); those traces are left out until the panel is given in the take-off file.`);
  }
  if (traces.length === 0) {
    const why = questions.length > 0 ? ` It asks: ${questions.join(' ')}` : '';
    throw new TakeoffError(
      `The automatic take-off found ${named.length} panel${named.length === 1 ? '' : 's'} on this scan (${named.join(', ') || 'none calibrated'}) but does not find the curves on scans yet; give each curve as a trace with guides in the take-off file and run --detect again (the panels are found again).${why}`,
    );
  }
  const document: Record<string, unknown> = { ...raw, sheet_sha256: sheet.sha256, panels, traces, detected: { by: RASTER_DETECTOR, questions } };
  return { takeoff: parseTakeoff(document), document, detection, questions };
}
