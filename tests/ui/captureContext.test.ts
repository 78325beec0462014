/**
 * The context the workbench hands every capture, as the headless replay hands it in: the panel's
 * frame, the other traces' guides and the same impeller's head trace.
 */
import { describe, expect, it } from 'vitest';
import { captureContext } from '../../src/ui/app/captureContext.ts';
import type { TraceDraft } from '../../src/ui/store/draft.ts';
import { draftWithPanel } from './fixtures.ts';

const trace = (id: string, quantity: TraceDraft['quantity'], diameter: number, guides: [number, number][]): TraceDraft => ({ id, panel: 'head-1', quantity, diameter, guides, method: 'auto' }) as TraceDraft;

describe('captureContext', () => {
  const draft = draftWithPanel({ traces: [trace('h330', 'head', 330, [[150, 200]]), trace('e330', 'efficiency', 330, [[160, 300]]), trace('h310', 'head', 310, [[150, 250]])] });

  it("gives a trace captured again its panel's frame, the other traces' guides and its head trace's guides", () => {
    const got = captureContext(draft, 'head-1', 'e330');
    expect(got.frame).toEqual([100, 100, 500, 400]);
    expect(got.siblings).toEqual([[[150, 200]], [[150, 250]]]);
    expect(got.companions).toEqual([[[150, 200]]]);
  });

  it('gives a new trace the head trace of the curve it is for, and every trace as a sibling', () => {
    const got = captureContext(draft, 'head-1', undefined, { panel: 'head-1', quantity: 'power', diameter: 310 });
    expect(got.siblings).toHaveLength(3);
    expect(got.companions).toEqual([[[150, 250]]]);
  });

  it('gives a head trace no companion, and a panel without a frame none', () => {
    const got = captureContext(draft, 'no-such-panel', 'h330');
    expect(got.companions).toEqual([]);
    expect(got.frame).toBeUndefined();
  });
});
