/**
 * The affinity rule Q ∝ D read from the power, NPSHr or efficiency panels' curve ends when the
 * head curves' own ends do not give it (src/digitize/detect/endFlows.ts, `panelEndRule`,
 * `withPanelRule`). Affinity for trims: flow in proportion to the impeller diameter (Karassik et
 * al., Pump Handbook; Lobanoff & Ross, Centrifugal Pumps); each trim drawn to the same point of its
 * own curve is common practice. Invented family: ends at 0.2 (m3/h per mm) · D on a 0–100 m3/h
 * axis, so the tolerance is 1 m3/h. Bed scans 43 and 73 are the sheets this was built for.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { endReferences, nameByEnds, panelEndRule, withPanelRule } from '../../src/digitize/detect/endFlows.ts';
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { detectBedScan } from '../../scripts/detectSheets/scanBed.ts';

afterAll(() => closeTextReaderNode());

const span = 100;
const k = 0.2;
const values = [390, 350, 310];
const ends = values.map((v) => k * v);

describe('panelEndRule', () => {
  it('takes k from two panels whose ends keep it, whatever the head ends say', () => {
    const power = [ends[2]! + 0.4, ends[0]! - 0.3, ends[1]!];
    const npshr = [ends[0]! + 0.2, ends[1]! + 0.5, ends[2]! - 0.2];
    expect(panelEndRule([power, npshr], [], values, span)).toBeCloseTo(k, 2);
  });
  it('takes k from one panel of three values when a head end, sure or not, lies on it', () => {
    expect(panelEndRule([ends], [{ value: 350, end: k * 350 + 0.5, sure: false }], values, span)).toBeCloseTo(k, 2);
    expect(panelEndRule([ends], [{ value: 350, end: 55, sure: true }], values, span)).toBeNull();
    expect(panelEndRule([ends.slice(0, 2)], [{ value: 390, end: k * 390, sure: true }], [390, 350], span)).toBeNull();
  });
  it('refuses a panel with a curve more or fewer than values, or ends off one k', () => {
    expect(panelEndRule([[...ends, 30], [...ends, 30]], [], values, span)).toBeNull();
    expect(panelEndRule([ends.slice(1), ends.slice(1)], [], values, span)).toBeNull();
    const off = [ends[0]!, ends[1]! - 3, ends[2]!];
    expect(panelEndRule([off, off], [], values, span)).toBeNull();
  });
  it('refuses two panels that keep the rule with different k', () => {
    expect(panelEndRule([ends, ends.map((e) => 0.9 * e)], [], values, span)).toBeNull();
  });
  it('adds k·D beside a head end off the rule, and the curve ending there is named by it', () => {
    // The 350 head curve ran on along an iso-line: its sure end is 10 m3/h late.
    const refs = withPanelRule(endReferences([{ value: 390, end: ends[0]!, sure: true }, { value: 350, end: ends[1]! + 10, sure: true }], values, span), k, values, span);
    expect(refs.filter((r) => r.how === 'predicted').map((r) => r.value).sort()).toEqual([310, 350]);
    const names = nameByEnds(ends.map((end) => ({ group: 'power', end, tracedEnd: end, span })), refs);
    expect(names.map((n) => n?.value)).toEqual(values);
  });
});

describe('on bed scans', () => {
  it('scan 43: head curves cut at their labels or run on along iso-lines; the power curves are named by their own ends', async () => {
    const { found } = await detectBedScan(43);
    const power = found.takeoff.traces.filter((t) => t.quantity === 'power').map((t) => t.diameter).sort();
    expect(power).toEqual([211, 237, 264, 290]);
  }, 60_000);
});
