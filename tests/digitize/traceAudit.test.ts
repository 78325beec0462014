/** No silent misses: the audit of captured traces against each other (src/digitize/traceAudit.ts). */
import { describe, expect, it } from 'vitest';
import { auditIsoCrossings, auditTraces, type AuditedTrace } from '../../src/digitize/traceAudit.ts';

const flows = (a: number, b: number) => Array.from({ length: 20 }, (_, i) => a + ((b - a) * i) / 19);
const trace = (id: string, quantity: AuditedTrace['quantity'], diameter: number, from: number, to: number, extra: Partial<AuditedTrace> = {}): AuditedTrace => ({
  id,
  describe: `${quantity} at diameter ${diameter}`,
  quantity,
  diameter,
  how: 'raster',
  flows: flows(from, to),
  length: 500,
  lostLength: 0,
  refusedGuides: 0,
  ...extra,
});
const text = (q: number) => `${q.toFixed(3)} m³/s`;
/** A trace of a speed family: named by its speed, no diameter. */
const bySpeed = (id: string, quantity: AuditedTrace['quantity'], rpm: number, from: number, to: number, extra: Partial<AuditedTrace> = {}): AuditedTrace => ({
  ...trace(id, quantity, 0, from, to, extra),
  diameter: undefined,
  speed: rpm,
  describe: `${quantity} at ${rpm} rpm`,
});

describe('trace audit', () => {
  const family = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089), trace('e370', 'efficiency', 370, 0, 0.1), trace('e330', 'efficiency', 330, 0, 0.089)];

  it('says nothing about a family whose traces run to their ends', () => {
    expect(auditTraces(family, text)).toEqual([]);
  });

  it('fails a trace that stops far short of where its neighbours end, naming it and what to do', () => {
    const found = auditTraces([...family.slice(0, 3), trace('e330', 'efficiency', 330, 0, 0.04)], text);
    expect(found).toHaveLength(1);
    expect(found[0]?.severity).toBe('fail');
    expect(found[0]?.trace).toBe('e330');
    expect(found[0]?.message).toMatch(/Add a guide near each end of this line where it stands alone/);
  });

  it('fails a trace that starts late, and one whose length was mostly bridged or whose guides found no line', () => {
    const late = auditTraces([...family.slice(0, 3), trace('e330', 'efficiency', 330, 0.03, 0.089)], text);
    expect(late.map((f) => [f.code, f.trace])).toEqual([['takeoff.trace-short', 'e330']]);
    const lost = auditTraces([...family.slice(0, 3), trace('e330', 'efficiency', 330, 0, 0.089, { lostLength: 80 })], text);
    expect(lost.map((f) => [f.code, f.severity])).toEqual([['takeoff.trace-untrusted', 'fail']]);
    const refused = auditTraces([...family.slice(0, 3), trace('e330', 'efficiency', 330, 0, 0.089, { refusedGuides: 1 })], text);
    expect(refused.map((f) => f.code)).toEqual(['takeoff.trace-untrusted']);
  });

  it('never suggests a negative flow for a short trace, though a neighbour read a hair left of the flow axis', () => {
    const found = auditTraces([trace('h370', 'head', 370, -0.0004, 0.1), trace('h330', 'head', 330, 0, 0.05)], text);
    expect(found.map((f) => [f.code, f.trace])).toEqual([['takeoff.trace-short', 'h330']]);
    expect(found[0]?.message).toMatch(/its neighbours suggest 0\.000 m³\/s to 0\.089 m³\/s/);
  });

  it('fails a trace spanning less than 30 % of its panel\'s flow axis, even when its neighbours were lost alike', () => {
    const axis = { axisFlow: [0, 0.12] as const };
    const found = auditTraces([trace('h370', 'head', 370, 0.02, 0.045, axis), trace('h330', 'head', 330, 0.02, 0.04, axis)], text);
    expect(found.map((f) => [f.code, f.trace])).toEqual([
      ['takeoff.trace-short', 'h370'],
      ['takeoff.trace-short', 'h330'],
    ]);
    expect(found[0]?.message).toMatch(/only 21 % of its panel's flow axis/);
  });

  it('fails a trace that steps onto another line (not smooth) and passes a smooth one', () => {
    const q = Array.from({ length: 120 }, (_, i) => (0.1 * i) / 119);
    const smooth = q.map((x) => 80 - 2000 * x * x);
    const stepped = smooth.map((v, i) => (i >= 60 ? v - 3 : v)); // 3 units of a 0–100 axis: a neighbouring line
    const ok = auditTraces([trace('h370', 'head', 370, 0, 0.1, { flows: q, values: smooth, valueSpan: 100 })], text);
    expect(ok).toEqual([]);
    const found = auditTraces([trace('h370', 'head', 370, 0, 0.1, { flows: q, values: stepped, valueSpan: 100 })], text);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.trace-jump', 'fail', 'h370']]);
  });

  it('fails head traces of two diameters that lie on one line or swap places, and passes a sound pair', () => {
    const q = Array.from({ length: 60 }, (_, i) => (0.1 * i) / 59);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 100, panel: 'head' };
    const big = q.map((x) => 80 - 2000 * x * x);
    const small = q.map((x) => 65 - 2400 * x * x);
    const pair = (a: number[], b: number[]) => auditTraces([trace('h370', 'head', 370, 0, 0.1, { ...axis, flows: q, values: a }), trace('h330', 'head', 330, 0, 0.1, { ...axis, flows: q, values: b })], text);
    expect(pair(big, small)).toEqual([]);
    // The smaller impeller's trace followed the larger one's line from 0.05 m³/s on.
    // (Its step onto that line is a jump of its own; the pair is said whatever the step looks like.)
    const onOne = pair(big, small.map((v, i) => ((q[i] as number) >= 0.05 ? (big[i] as number) : v))).filter((f) => f.code !== 'takeoff.trace-jump');
    expect(onOne.map((f) => [f.code, f.severity, f.trace])).toEqual([
      ['takeoff.trace-neighbour', 'fail', 'h370'],
      ['takeoff.trace-neighbour', 'fail', 'h330'],
    ]);
    expect(onOne[0]?.message).toMatch(/lie on one line/);
    // The larger impeller's trace dropped below the smaller one's: out of order.
    const swapped = pair(big.map((v, i) => ((q[i] as number) >= 0.06 ? (small[i] as number) - 5 : v)), small).filter((f) => f.code !== 'takeoff.trace-jump');
    expect(swapped.map((f) => f.code)).toEqual(['takeoff.trace-neighbour', 'takeoff.trace-neighbour']);
    expect(swapped[0]?.message).toMatch(/swap places/);
    // Traces on different panels are not compared.
    expect(auditTraces([trace('h370', 'head', 370, 0, 0.1, { ...axis, flows: q, values: big }), trace('h330', 'head', 330, 0, 0.1, { ...axis, panel: 'other', flows: q, values: big })], text)).toEqual([]);
  });

  it('lets efficiency and NPSHr curves bunch near shut-off, and fails two that lie on one line far past it', () => {
    const q = Array.from({ length: 60 }, (_, i) => (0.1 * i) / 59);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 8, panel: 'npsh' };
    // Invented NPSHr curves that run together up to a third of the flow range, then part.
    const base = q.map((x) => 2 + 300 * x * x);
    const parted = q.map((x, i) => (base[i] as number) + (x > 0.033 ? 40 * (x - 0.033) : 0));
    const pair = (a: number[], b: number[]) => auditTraces([trace('n370', 'npshr', 370, 0, 0.1, { ...axis, flows: q, values: a }), trace('n330', 'npshr', 330, 0, 0.1, { ...axis, flows: q, values: b })], text).filter((f) => f.code === 'takeoff.trace-neighbour');
    expect(pair(base, parted)).toEqual([]);
    // The 370 trace followed the 330 line all the way: one drawn line traced twice.
    const same = pair(parted, parted);
    expect(same.map((f) => [f.severity, f.trace])).toEqual([
      ['fail', 'n370'],
      ['fail', 'n330'],
    ]);
    expect(same[0]?.message).toMatch(/lie on one line over \d+ % of the flow axis, far past where curves of a family run together/);
    // Efficiency curves are held the same way; iso-lines are not held to it.
    const eff = auditTraces([trace('e370', 'efficiency', 370, 0, 0.1, { ...axis, flows: q, values: parted }), trace('e330', 'efficiency', 330, 0, 0.1, { ...axis, flows: q, values: parted })], text).filter((f) => f.code === 'takeoff.trace-neighbour');
    expect(eff).toHaveLength(2);
  });

  it('holds the traces of a speed family to the same rule, naming them by their speeds', () => {
    const q = Array.from({ length: 60 }, (_, i) => (0.1 * i) / 59);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 8, panel: 'npsh' };
    const levelTrace = (id: string, quantity: AuditedTrace['quantity'], rpm: number, values: number[], valueSpan = 8): AuditedTrace => ({
      ...trace(id, quantity, 0, 0, 0.1, { ...axis, valueSpan, flows: q, values }),
      diameter: undefined,
      speed: rpm,
      describe: `${quantity} at ${rpm} rpm on panel "npsh"`,
    });
    // Invented NPSHr curves of 1750 and 1600 rpm that run together up to a third of the flow range, then part.
    const base = q.map((x) => 2 + 300 * x * x);
    const parted = q.map((x, i) => (base[i] as number) + (x > 0.033 ? 40 * (x - 0.033) : 0));
    const neighbours = (list: AuditedTrace[]) => auditTraces(list, text).filter((f) => f.code === 'takeoff.trace-neighbour');
    expect(neighbours([levelTrace('n1750', 'npshr', 1750, parted), levelTrace('n1600', 'npshr', 1600, base)])).toEqual([]);
    // Efficiency by the speed law, η(Q, n) = η_rated(Q·n_rated/n): zero together at shut-off, parted past it.
    const eta = (x: number, s: number) => 84 * (x / s / 0.08) * (2 - x / s / 0.08);
    expect(neighbours([levelTrace('e1750', 'efficiency', 1750, q.map((x) => eta(x, 1)), 100), levelTrace('e1400', 'efficiency', 1400, q.map((x) => eta(x, 0.8)), 100)])).toEqual([]);
    // The 1600 rpm trace followed the 1750 rpm line all the way: one drawn line traced twice.
    const same = neighbours([levelTrace('n1750', 'npshr', 1750, parted), levelTrace('n1600', 'npshr', 1600, parted)]);
    expect(same.map((f) => [f.severity, f.trace, f.figures?.speed_rpm, f.figures?.other_speed_rpm])).toEqual([
      ['fail', 'n1750', 1750, 1600],
      ['fail', 'n1600', 1600, 1750],
    ]);
    expect(same[0]?.message).toMatch(/^Trace n1750 \(npshr at 1750 rpm on panel "npsh"\) and trace n1600 \(npshr at 1600 rpm on panel "npsh"\) lie on one line over \d+ % of the flow axis, far past where curves of a family run together/);
    // Head traces of two speeds on one line: a faster speed's head lies above a slower one's (H ∝ n²).
    const head = q.map((x) => 80 - 2000 * x * x);
    const heads = neighbours([levelTrace('h1750', 'head', 1750, head, 100), levelTrace('h1600', 'head', 1600, head, 100)]);
    expect(heads.map((f) => f.trace)).toEqual(['h1750', 'h1600']);
    expect(heads[0]?.message).toMatch(/where a faster speed's head lies above a slower one's everywhere/);
  });

  it('fails an NPSHr trace ending before 95 % of its own head trace\'s end, and passes one drawn to it', () => {
    const heads = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089)];
    const npshr = (to: number) => auditTraces([...heads, trace('n370', 'npshr', 370, 0.02, to), trace('n330', 'npshr', 330, 0.018, 0.089)], text);
    expect(npshr(0.1)).toEqual([]);
    expect(npshr(0.096)).toEqual([]);
    // 0.09 of 0.1: within the family's 85 % bar, but short of its own head curve's end.
    const found = npshr(0.09);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.trace-short', 'fail', 'n370']]);
    expect(found[0]?.message).toMatch(/while the head trace of the same diameter runs to 0\.100 m³\/s/);
  });

  it('warns of NPSHr traces that all start past 45 % of their head curves\' ends, where the family comparison sees nothing', () => {
    const heads = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089)];
    // Both NPSHr lines faded alike below mid-range: each starts as late as the other.
    const found = auditTraces([...heads, trace('n370', 'npshr', 370, 0.055, 0.1), trace('n330', 'npshr', 330, 0.049, 0.089)], text);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([
      ['takeoff.npshr-start-late', 'warn', 'n370'],
      ['takeoff.npshr-start-late', 'warn', 'n330'],
    ]);
    expect(found[0]?.message).toMatch(/starts at 0\.055 m³\/s, 55 % of the way to the end of the head trace of the same diameter \(0\.100 m³\/s\).*below that flow its NPSHr is extrapolated/);
    // From 40 % of the head's end: no warning.
    expect(auditTraces([...heads, trace('n370', 'npshr', 370, 0.04, 0.1), trace('n330', 'npshr', 330, 0.035, 0.089)], text)).toEqual([]);
  });

  it('warns of a power trace starting well after its own head trace, whose neighbours start late alike (not of efficiency, often drawn from part way)', () => {
    // Invented: heads drawn from shut-off; every power line faded below about 14 % of its end
    // (random bed fresh seed 875: a dotted power line followed from one guide, 1.5 % of span off, said nothing).
    const heads = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089)];
    const found = auditTraces([...heads, trace('p370', 'power', 370, 0.014, 0.1), trace('p330', 'power', 330, 0.012, 0.089)], text);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([
      ['takeoff.power-start-late', 'warn', 'p370'],
      ['takeoff.power-start-late', 'warn', 'p330'],
    ]);
    expect(found[0]?.message).toMatch(/starts at 0\.014 m³\/s, while the head trace of the same diameter starts at 0\.000 m³\/s, and a power curve is drawn from shut-off/);
    // Within a tenth of the head's end flow of the head's own start: no warning.
    expect(auditTraces([...heads, trace('p370', 'power', 370, 0.009, 0.1), trace('p330', 'power', 330, 0.008, 0.089)], text)).toEqual([]);
    // Efficiency curves starting as late: no warning.
    expect(auditTraces([...heads, trace('e370', 'efficiency', 370, 0.014, 0.1), trace('e330', 'efficiency', 330, 0.012, 0.089)], text)).toEqual([]);
  });

  it('gives a speed family\'s traces the per-trace checks, scaling coverage by speed (Q ∝ n)', () => {
    // Invented: 1750 rpm runs to 0.1 m³/s, 1400 rpm to 0.08 (0.1 × 1400/1750).
    const speeds = [bySpeed('h1750', 'head', 1750, 0, 0.1), bySpeed('h1400', 'head', 1400, 0, 0.08), bySpeed('p1750', 'power', 1750, 0, 0.1), bySpeed('p1400', 'power', 1400, 0, 0.08)];
    expect(auditTraces(speeds, text)).toEqual([]);
    // Stopping at 0.05 where Q ∝ n says 0.08: short, named by its speed.
    const short = auditTraces([...speeds.slice(0, 3), bySpeed('p1400', 'power', 1400, 0, 0.05)], text);
    expect(short.map((f) => [f.code, f.trace])).toEqual([['takeoff.trace-short', 'p1400']]);
    expect(short[0]?.message).toMatch(/^Trace p1400 \(power at 1400 rpm\) covers flows/);
    // Mostly bridged, or a guide that found no line: untrusted, as for a diameter family.
    const lost = auditTraces([...speeds.slice(0, 3), bySpeed('p1400', 'power', 1400, 0, 0.08, { lostLength: 80 })], text);
    expect(lost.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.trace-untrusted', 'fail', 'p1400']]);
    const refused = auditTraces([...speeds.slice(0, 3), bySpeed('p1400', 'power', 1400, 0, 0.08, { refusedGuides: 1 })], text);
    expect(refused.map((f) => f.code)).toEqual(['takeoff.trace-untrusted']);
    // A speed trace is never held against a diameter trace.
    expect(auditTraces([...speeds, trace('h370', 'head', 370, 0, 0.3)], text)).toEqual([]);
  });

  it('holds a speed family to the peak order and to every quantity the other speeds have', () => {
    // Invented: efficiency by the speed law, η(Q, n) = η_rated(Q·n_rated/n), peak at 0.07 m³/s at 1750 rpm.
    const q = Array.from({ length: 60 }, (_, i) => (0.1 * i) / 59);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 100, panel: 'eff' };
    const eta = (top: number, best: number) => q.map((x) => top * (x / best) * (2 - x / best));
    const pair = (fast: number[], slow: number[]) =>
      auditTraces([bySpeed('e1750', 'efficiency', 1750, 0, 0.1, { ...axis, flows: q, values: fast }), bySpeed('e1400', 'efficiency', 1400, 0, 0.1, { ...axis, flows: q, values: slow })], text).filter((f) => f.code === 'takeoff.trace-peaks');
    expect(pair(eta(80, 0.07), eta(79, 0.056))).toEqual([]); // the slower speed loses a point: as it should
    const found = pair(eta(80, 0.07), eta(84, 0.056)); // the slower speed gains four points: one trace is off
    expect(found.map((f) => f.trace)).toEqual(['e1750', 'e1400']);
    expect(found[0]?.message).toMatch(/while a slower speed reaches at most the faster one's best efficiency/);

    // A speed with a head trace but no power trace, while the other speed has one.
    const missing = auditTraces([bySpeed('h1750', 'head', 1750, 0, 0.1), bySpeed('h1400', 'head', 1400, 0, 0.08), bySpeed('p1750', 'power', 1750, 0, 0.1)], text);
    expect(missing.map((f) => [f.code, f.severity, f.figures?.speed_rpm])).toEqual([['takeoff.quantity-missing', 'warn', 1400]]);
    expect(missing[0]?.message).toMatch(/^Speed 1400 rpm has a head trace but no power trace, while speed 1750 rpm has one/);
  });

  it('fails a trace that runs level over a fifth of the flow axis (a grid line), and passes a flat-topped head curve', () => {
    const q = Array.from({ length: 120 }, (_, i) => (0.1 * i) / 119);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 100 };
    const peaked = q.map((x) => 80 + 100 * x - 1500 * x * x); // peak at 0.033 m³/s, as flat as a drooping head curve gets
    expect(auditTraces([trace('h370', 'head', 370, 0, 0.1, { ...axis, flows: q, values: peaked })], text)).toEqual([]);
    const onGrid = peaked.map((v, i) => ((q[i] as number) >= 0.06 ? (peaked[71] as number) : v)); // level at the grid value from 0.06 on
    const found = auditTraces([trace('h370', 'head', 370, 0, 0.1, { ...axis, flows: q, values: onGrid })], text);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.trace-level', 'fail', 'h370']]);
    expect(found[0]?.message).toMatch(/as a grid line does/);
  });

  it('warns of a smaller impeller whose efficiency trace peaks above the larger one\'s, naming both', () => {
    const q = Array.from({ length: 60 }, (_, i) => (0.1 * i) / 59);
    const axis = { axisFlow: [0, 0.12] as const, valueSpan: 100, panel: 'eff' };
    const eta = (top: number, best: number) => q.map((x) => top * (x / best) * (2 - x / best));
    const pair = (a: number[], b: number[]) => auditTraces([trace('e370', 'efficiency', 370, 0, 0.1, { ...axis, flows: q, values: a }), trace('e330', 'efficiency', 330, 0, 0.1, { ...axis, flows: q, values: b })], text).filter((f) => f.code === 'takeoff.trace-peaks');
    expect(pair(eta(80, 0.07), eta(78, 0.063))).toEqual([]); // the trim loses two points: as it should
    const found = pair(eta(80, 0.07), eta(83, 0.063)); // the trim gains three points: one trace is off
    expect(found.map((f) => [f.severity, f.trace])).toEqual([
      ['warn', 'e370'],
      ['warn', 'e330'],
    ]);
  });

  it('holds an NPSHr trace to the end of its own diameter\'s head trace', () => {
    const heads = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089)];
    expect(auditTraces([...heads, trace('n370', 'npshr', 370, 0.02, 0.1), trace('n330', 'npshr', 330, 0.018, 0.089)], text)).toEqual([]);
    const short = auditTraces([...heads, trace('n370', 'npshr', 370, 0.02, 0.06)], text);
    expect(short.map((f) => [f.code, f.trace])).toEqual([['takeoff.trace-short', 'n370']]);
  });

  it('fails an efficiency trace that ends far before the farthest head trace of the family, scaled to its diameter, when its own head trace was lost alike', () => {
    // Every trace of the smaller impeller stops early, so its neighbours excuse it; the larger
    // impeller's head curve, scaled by Q ∝ D, says where its efficiency curve should end.
    const found = auditTraces([trace('h370', 'head', 370, 0, 0.1), trace('e370', 'efficiency', 370, 0, 0.06), trace('h330', 'head', 330, 0, 0.05), trace('e330', 'efficiency', 330, 0, 0.055)], text);
    const reach = found.filter((f) => f.code === 'takeoff.trace-reach');
    expect(reach.map((f) => [f.trace, f.severity])).toEqual([['e330', 'fail']]);
    expect(reach[0]?.message).toMatch(/Trace e330 \(efficiency at diameter 330\) covers flows 0\.000 m³\/s to 0\.055 m³\/s, while the head trace h370 .* suggests an end near 0\.089 m³\/s/);
    expect(reach[0]?.message).toMatch(/Add a guide near that end of this line where it stands alone/);
    // Within three quarters of that end the trace passes (sheets may stop efficiency a little early).
    const ok = auditTraces([trace('h370', 'head', 370, 0, 0.1), trace('e370', 'efficiency', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089), trace('e330', 'efficiency', 330, 0, 0.072)], text);
    expect(ok.filter((f) => f.code === 'takeoff.trace-reach')).toEqual([]);
  });

  it('fails a trace that starts much later than the earliest of its quantity scaled to its diameter, when the start/end ratios hide it', () => {
    const heads = [trace('h370', 'head', 370, 0, 0.1), trace('h330', 'head', 330, 0, 0.089)];
    const found = auditTraces([...heads, trace('n370', 'npshr', 370, 0.02, 0.05), trace('n330', 'npshr', 330, 0.04, 0.089)], text);
    expect(found.filter((f) => f.code === 'takeoff.trace-reach').map((f) => f.trace)).toEqual(['n330']);
    expect(found.find((f) => f.trace === 'n330')?.message).toMatch(/suggests a start near 0\.018 m³\/s; the line was probably lost at its low-flow end/);
    const ok = auditTraces([...heads, trace('n370', 'npshr', 370, 0.02, 0.1), trace('n330', 'npshr', 330, 0.018, 0.089)], text);
    expect(ok).toEqual([]);
  });

  it('leaves vector traces and explicit points alone', () => {
    expect(auditTraces([...family.slice(0, 3), trace('e330', 'efficiency', 330, 0, 0.04, { how: 'vector' })], text)).toEqual([]);
  });

  it('warns of a diameter with a head trace but no trace of a quantity the others have', () => {
    const found = auditTraces(family.slice(0, 3), text);
    expect(found.map((f) => [f.code, f.severity])).toEqual([['takeoff.quantity-missing', 'warn']]);
    expect(found[0]?.message).toMatch(/Diameter 330 has a head trace but no efficiency trace/);
  });

  it('fails an iso level that meets one head curve more than twice, and warns of a head curve no level meets', () => {
    const found = auditIsoCrossings(
      [
        { trace: 'iso70', describe: '', level: 70, perHead: new Map([[370, 5], [330, 2]]) },
        { trace: 'iso60', describe: '', level: 60, perHead: new Map([[370, 2], [330, 1]]) },
      ],
      [370, 330, 290],
    );
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([
      ['takeoff.iso-crossings', 'fail', 'iso70'],
      ['takeoff.iso-none-for-diameter', 'warn', undefined],
    ]);
  });

  it('warns of a head curve between two that an iso level meets, where that level found no crossing', () => {
    const found = auditIsoCrossings(
      [
        { trace: 'iso70-left', describe: '', level: 70, perHead: new Map([[370, 1], [290, 1]]) },
        { trace: 'iso60-left', describe: '', level: 60, perHead: new Map([[370, 1], [330, 1], [290, 1]]) },
      ],
      [370, 330, 290],
    );
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.iso-gap', 'warn', 'iso70-left']]);
    expect(found[0]?.message).toMatch(/level 70 meets the head traces of diameters 290 and 370 but not that of diameter 330/);
    expect(found[0]?.message).toMatch(/add a guide on the iso-line/);
  });

  it('fails an iso-trace bridged over more than a tenth of its length, naming it', () => {
    const iso = { ...trace('iso70', 'efficiency', 0, 0.02, 0.08, { lostLength: 80 }), diameter: undefined, iso: 70 };
    const found = auditTraces([...family, iso], text);
    expect(found.map((f) => [f.code, f.severity, f.trace])).toEqual([['takeoff.trace-untrusted', 'fail', 'iso70']]);
    expect(found[0]?.message).toMatch(/^Iso-trace iso70 .* cannot be trusted: 16 % of its length was not seen/);
    expect(auditTraces([...family, { ...iso, lostLength: 20 }], text)).toEqual([]);
  });
});
