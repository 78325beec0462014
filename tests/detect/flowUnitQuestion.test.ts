/**
 * The flow unit of a found sheet is one question, however many panels' flow titles leave it
 * open: an unknown unit read ("(mam)" for m³/h on a blurred photo) or no title with a unit.
 * INVENTED panels.
 */
import { describe, expect, it } from 'vitest';
import { takeoffPanels } from '../../src/digitize/detect/detect.ts';
import type { FoundPanel } from '../../src/digitize/detect/panels.ts';

function panel(id: string, quantity: FoundPanel['quantity'], flowTitle: string | null, xUnit: string | null): FoundPanel {
  return {
    id,
    quantity,
    frame: [0, 0, 100, 50],
    side: 'left',
    proposal: { anchors: [{ at: [0, 50], x: 0, y: 0 }, { at: [100, 50], x: 100, y: 0 }, { at: [0, 0], x: 0, y: 50 }], xScale: 'linear', yScale: 'linear' },
    title: null,
    flowTitle,
    yUnit: null,
    xUnit,
    confidence: 0.9,
  } as unknown as FoundPanel;
}

const units = { flow: 'm3/h', head: 'm', power: 'kW', npsh: 'm', diameter: 'mm' } as const;

describe('the flow unit of the panels found', () => {
  it('is asked once for all the panels whose titles leave it open, naming each', () => {
    const questions: string[] = [];
    const { panels } = takeoffPanels([panel('head', 'head', 'Flow Q (mam)', 'mam'), panel('power', 'power', 'Flow Q (m3/m)', 'm3/m'), panel('npshr', 'npshr', null, null)], [], units as never, questions);
    expect(panels.map((p) => p.id)).toEqual(['head', 'power', 'npshr']);
    expect(questions).toEqual([
      'The flow titles "Flow Q (mam)" of panel "head", "Flow Q (m3/m)" of panel "power" name a unit this tool does not know, and panel "npshr" has no flow title with a unit; the take-off\'s flow unit m3/h is used. Is that the sheet\'s?',
    ]);
  });

  it('asks nothing when every panel names a known flow unit', () => {
    const questions: string[] = [];
    takeoffPanels([panel('head', 'head', 'Flow Q (gpm)', 'gpm'), panel('power', 'power', 'Flow Q (gpm)', 'gpm')], [], units as never, questions);
    expect(questions).toEqual([]);
  });
});
