import { describe, expect, it } from 'vitest';
import { affinityRule, endMatch, endReferences, nameByEnds, type EndReference } from '../../src/digitize/detect/endFlows.ts';

// An invented family: end of curve at 0.2 (m3/h per mm) · D, flow axis 0–100 m3/h, so the
// tolerance is 1 m3/h. Affinity Q ∝ D for trims (Karassik et al., Pump Handbook; Lobanoff & Ross,
// Centrifugal Pumps).
const span = 100;
const k = 0.2;

describe('end flows of the head curves', () => {
  it('keeps only the sure ends when the head ends do not vouch for a rule', () => {
    const refs = endReferences([{ value: 390, end: 78, sure: true }, { value: 350, end: 61, sure: false }], [], span);
    expect(refs).toEqual([{ value: 390, end: 78, how: 'sure' }]);
  });

  it('vouches for an unsure head whose end keeps the rule of two sure ones, and predicts a value given with no head', () => {
    const heads = [
      { value: 390, end: k * 390, sure: true },
      { value: 370, end: k * 370 + 0.3, sure: false },
      { value: 350, end: 40, sure: false }, // ran off onto another line: not a reference
      { value: 310, end: k * 310, sure: true },
    ];
    const refs = endReferences(heads, [390, 370, 350, 330, 310], span);
    expect(refs.find((r) => r.value === 370)).toEqual({ value: 370, end: k * 370 + 0.3, how: 'vouched' });
    const at350 = refs.find((r) => r.value === 350);
    expect(at350?.how).toBe('predicted');
    expect(at350?.end).toBeCloseTo(k * 350, 0);
    expect(refs.find((r) => r.value === 330)?.how).toBe('predicted');
    expect(refs.filter((r) => r.how === 'sure').map((r) => r.value)).toEqual([390, 310]);
  });

  it('needs two agreeing ends with one sure, or three: one sure head alone sets no rule', () => {
    expect(affinityRule([{ value: 390, end: 78, sure: true }], span)).toBeNull();
    expect(affinityRule([{ value: 390, end: 78, sure: false }, { value: 310, end: 62, sure: false }], span)).toBeNull();
    const three = affinityRule([{ value: 390, end: 78, sure: false }, { value: 350, end: 70, sure: false }, { value: 310, end: 62, sure: false }], span);
    expect(three?.k).toBeCloseTo(0.2, 6);
    expect(endReferences([{ value: 390, end: 78, sure: true }], [390, 310], span)).toEqual([{ value: 390, end: 78, how: 'sure' }]);
  });

  it('sets no rule when two groups of head ends are as large (a sheet whose trims end elsewhere)', () => {
    const heads = [
      { value: 400, end: 80, sure: true },
      { value: 380, end: 76, sure: true },
      { value: 360, end: 60, sure: true },
      { value: 340, end: 56.7, sure: true },
    ];
    expect(affinityRule(heads, span)).toBeNull();
    expect(endReferences(heads, [400, 380, 360, 340, 320], span).map((r) => r.how)).toEqual(['sure', 'sure', 'sure', 'sure']);
  });

  it('gives a sure head whose end is off a rule three others keep both its own end and the rule\'s', () => {
    const heads = [
      { value: 400, end: k * 400, sure: true },
      { value: 380, end: k * 380 + 4, sure: true }, // the finder ran on past this line's end
      { value: 360, end: k * 360, sure: true },
      { value: 340, end: k * 340, sure: true },
    ];
    const at380 = endReferences(heads, [], span).filter((r) => r.value === 380);
    expect(at380.map((r) => r.how)).toEqual(['sure', 'predicted']);
    expect(at380[1]?.end).toBeCloseTo(k * 380, 1);
    // With only two others keeping the rule, the sure end stands alone.
    expect(endReferences(heads.slice(0, 3), [], span).filter((r) => r.value === 380).map((r) => r.how)).toEqual(['sure']);
  });

  it('takes no evidence from two curves of one name', () => {
    expect(affinityRule([{ value: 390, end: 78, sure: true }, { value: 390, end: 78.2, sure: false }], span)).toBeNull();
  });
});

describe('names by where a curve ends', () => {
  const refs: EndReference[] = [
    { value: 390, end: 78, how: 'sure' },
    { value: 370, end: 74, how: 'predicted' },
    { value: 350, end: 70, how: 'sure' },
  ];
  it('names a curve ending at exactly one value\'s end, and none between two', () => {
    expect(endMatch(refs, 74.5, span, 0.02)).toMatchObject({ best: { r: { value: 370 } }, sole: true });
    expect(endMatch(refs, 72, span, 0.02).sole).toBe(false); // midway between 370 and 350
    expect(endMatch(refs, 90, span, 0.02).sole).toBe(false); // past every end
  });

  it('proposes the tracer\'s end only where the line found ends clearly elsewhere, closely, and at a value not taken on the panel', () => {
    const names = nameByEnds(
      [
        { group: 'power', end: 78.2, tracedEnd: 78.1, span }, // the 390 curve
        { group: 'power', end: 85, tracedEnd: 70.3, span }, // the line found overran; the tracer ends at 350
        { group: 'power', end: 40, tracedEnd: 78.2, span }, // a piece whose tracer ran on along the 390 line
        { group: 'npshr', end: 60, tracedEnd: 73, span }, // the tracer's end is near no end closely enough
        { group: 'npshr', end: 70.1, tracedEnd: 70.1, span, value: 350 }, // named already
      ],
      refs,
    );
    expect(names.map((n) => (n ? `${n.value} ${n.by}` : null))).toEqual(['390 end flow', '350 traced end', null, null, null]);
  });
});
