/** A small draft with one calibrated head panel, for the tests of actions, tools and files. */
import { EMPTY_DRAFT, type Draft, type PanelDraft } from '../../src/ui/store/draft.ts';

export const HEAD_PANEL: PanelDraft = {
  id: 'head-1',
  plots: 'head',
  frame: [100, 100, 500, 400],
  anchors: [
    { at: [100, 400], label: 'x left', x: 0 },
    { at: [500, 400], label: 'x right', x: 400 },
    { at: [100, 400], label: 'y bottom', y: 0 },
    { at: [100, 100], label: 'y top', y: 60 },
  ],
  x_scale: 'linear',
  y_scale: 'linear',
  units: { x: 'm3/h', y: 'm' },
};

export function draftWithPanel(extra: Partial<Draft> = {}): Draft {
  return {
    ...EMPTY_DRAFT,
    sheet: { path: 'invented.pdf', name: 'invented.pdf', kind: 'pdf', mime: 'application/pdf', page: 1, pageCount: 1, width: 600, height: 800, sha256: 'a'.repeat(64) },
    sheet_sha256: 'a'.repeat(64),
    pump: { name: 'Invented test pump', speed_rpm: 1480, specific_gravity: 1 },
    diameters: [330, 310],
    panels: [HEAD_PANEL],
    ...extra,
  };
}
