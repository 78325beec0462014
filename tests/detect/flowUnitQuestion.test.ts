/**
 * The flow unit of a found sheet is one question, however many panels' flow titles leave it
 * open: an unknown unit read ("(mam)" for m³/h on a blurred photo) or no title with a unit.
 * INVENTED panels.
 */
import { describe, expect, it } from 'vitest';
import { takeoffPanels } from '../../src/digitize/detect/detect.ts';
import type { Box, FoundPanel } from '../../src/digitize/detect/panels.ts';
import { sharedFlowTitles } from '../../src/digitize/detect/rasterPanels.ts';

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

/** A panel found on a scan with flow labels 0, 100 … 400 at 100 + 200·k level pixels (shifted by `shift`). */
function stacked(id: string, quantity: FoundPanel['quantity'], flowTitle: string | null, xUnit: string | null, values = [0, 100, 200, 300, 400], shift = 0): FoundPanel {
  const p = panel(id, quantity, flowTitle, xUnit);
  return { ...p, proposal: { ...p.proposal, x: { scale: 'linear', labels: values.map((value, k) => ({ value, at: 100 + 200 * k + shift, text: String(value) })) } } } as unknown as FoundPanel;
}

describe('panels stacked over one flow axis', () => {
  it('take the one flow title printed under the lowest when their flow labels are the same values at the same places', () => {
    const panels = [stacked('head', 'head', null, null), stacked('power', 'power', null, null, undefined, 3), stacked('npshr', 'npshr', 'Flow (m3/h)', 'm3/h')];
    const frames = new Map<FoundPanel, Box>(panels.map((p, i) => [p, [80, 100 + 400 * i, 920, 400 + 400 * i]]));
    sharedFlowTitles(panels, frames, 14);
    expect(panels.map((p) => p.xUnit)).toEqual(['m3/h', 'm3/h', 'm3/h']);
    const questions: string[] = [];
    takeoffPanels(panels, [], units as never, questions);
    expect(questions).toEqual([]);
  });

  it('keep no title when their flow labels differ, when the frames do not line up, or when two flow units were read', () => {
    const otherValues = [stacked('head', 'head', null, null, [0, 50, 100, 150, 200]), stacked('npshr', 'npshr', 'Flow (m3/h)', 'm3/h')];
    sharedFlowTitles(otherValues, new Map(otherValues.map((p, i) => [p, [80, 100 + 400 * i, 920, 400 + 400 * i] as Box])), 14);
    expect(otherValues[0]!.xUnit).toBeNull();
    const beside = [stacked('head', 'head', null, null), stacked('npshr', 'npshr', 'Flow (m3/h)', 'm3/h')];
    sharedFlowTitles(beside, new Map([[beside[0]!, [80, 100, 920, 400] as Box], [beside[1]!, [1000, 100, 1840, 400] as Box]]), 14);
    expect(beside[0]!.xUnit).toBeNull();
    const twoUnits = [stacked('head', 'head', null, null), stacked('power', 'power', 'Flow (gpm)', 'gpm'), stacked('npshr', 'npshr', 'Flow (m3/h)', 'm3/h')];
    sharedFlowTitles(twoUnits, new Map(twoUnits.map((p, i) => [p, [80, 100 + 400 * i, 920, 400 + 400 * i] as Box])), 14);
    expect(twoUnits[0]!.xUnit).toBeNull();
  });
});

