/**
 * The detector's rules on small INVENTED synthetic sheets: spurious tick proposals go, a
 * missing label is filled by order only when the sheet names as many diameters as it draws
 * curves, labels against the order and unreadable ticks become questions, never guesses.
 */
import { describe, expect, it } from 'vitest';
import { detectSheet } from '../../src/digitize/detect/detect.ts';
import { proposePanels } from '../../src/digitize/autoCalibrate.ts';
import { labelBeside, labelOn, syntheticSheet, type PanelSpec } from './syntheticSheet.ts';

// Invented head curves H = s² · 60 · (1 − 0.4 (Q / (s · 300))²), s = d / 250.
const head = (d: number) => (q: number) => (d / 250) ** 2 * 60 * (1 - 0.4 * (q / ((d / 250) * 300)) ** 2);
const end = (d: number) => (d / 250) * 330;
const power = (d: number) => (q: number) => (d / 250) ** 3 * 20 + 0.04 * q * (d / 250);

const headPanel = (diameters: number[]): PanelSpec => ({
  title: 'Head (m)',
  frame: [80, 60, 480, 300],
  x: { min: 0, max: 400, step: 50 },
  y: { min: 0, max: 80, step: 10 },
  curves: diameters.map((d) => ({ value: head(d), end: end(d) })),
});
const powerPanel = (diameters: number[], yTexts?: string[]): PanelSpec => ({
  title: 'Power (kW)',
  frame: [80, 360, 480, 520],
  x: { min: 0, max: 400, step: 50 },
  y: { min: 0, max: 40, step: 10 },
  curves: diameters.map((d) => ({ value: power(d), end: end(d) })),
  ...(yTexts ? { yTexts } : {}),
});

const named = (d: ReturnType<typeof detectSheet>) =>
  d.labelled.filter((l) => l.curve.kind === 'curve').map((l) => `${l.curve.quantity}:${l.value}:${l.how}`).sort();

/** A labelled head panel over a power panel whose value ticks are printed as `yTexts`. */
function withPowerTicks(yTexts: string[]): ReturnType<typeof detectSheet> {
  const h = headPanel([250, 230]);
  const p = powerPanel([250, 230], yTexts);
  const labels = [250, 230].map((d) => labelOn(h, 0.6 * end(d), head(d)(0.6 * end(d)), `${d} mm`));
  const { paths, text } = syntheticSheet([h, p], labels);
  return detectSheet(text, paths);
}

describe('automatic take-off rules', () => {
  it('finds both panels with their quantities and units, and every labelled curve', () => {
    const h = headPanel([250, 230, 210]);
    const p = powerPanel([250, 230, 210]);
    const labels = [250, 230, 210].map((d) => labelBeside(h, end(d), head(d)(end(d)), `${d} mm`));
    const { paths, text } = syntheticSheet([h, p], labels);
    const d = detectSheet(text, paths);
    expect(d.panels.map((k) => [k.quantity, k.yUnit, k.xUnit])).toEqual([
      ['head', 'm', 'm3/h'],
      ['power', 'kW', 'm3/h'],
    ]);
    expect(d.questions).toEqual([]);
    // Head curves by their labels; power curves by the flow at which each impeller's curves end.
    expect(named(d)).toEqual(['head:210:label', 'head:230:label', 'head:250:label', 'power:210:end-flow', 'power:230:end-flow', 'power:250:end-flow']);
  });

  it('drops rows and columns of numbers that belong to no frame', () => {
    const h = headPanel([250, 230]);
    const labels = [250, 230].map((d) => labelOn(h, 0.6 * end(d), head(d)(0.6 * end(d)), `${d} mm`));
    // A small table of numbers with its own rules, outside every frame.
    const table = syntheticSheet([{ title: 'Table', frame: [560, 60, 700, 140], x: { min: 0, max: 4, step: 1 }, y: { min: 0, max: 40, step: 10 }, curves: [] }]);
    const sheet = syntheticSheet([h], labels);
    const paths = [...sheet.paths, ...table.paths.filter((p) => p.stroke !== '#000000')];
    const d = detectSheet([...sheet.text, ...table.text.filter((t) => /^\d+$/.test(t.text))], paths);
    expect(d.panels).toHaveLength(1);
    expect(d.droppedProposals).toBeGreaterThanOrEqual(1);
    // Without the frames rule the table would be a panel of its own.
    expect(proposePanels(d.panels.length ? [...sheet.text, ...table.text.filter((t) => /^\d+$/.test(t.text))] : [], paths).length).toBeGreaterThan(1);
    expect(named(d)).toEqual(['head:230:label', 'head:250:label']);
  });

  it('fills a missing label by order when the sheet names as many diameters as it draws head curves', () => {
    const h = headPanel([250, 230, 210]);
    const p = powerPanel([250, 230, 210]);
    const labels = [
      labelOn(h, 0.6 * end(250), head(250)(0.6 * end(250)), '250 mm'),
      labelOn(h, 0.6 * end(210), head(210)(0.6 * end(210)), '210 mm'),
      // 230 mm is named only on the power panel.
      labelBeside(p, end(230), power(230)(end(230)), '230 mm'),
    ];
    const { paths, text } = syntheticSheet([h, p], labels);
    const d = detectSheet(text, paths);
    expect(d.questions).toEqual([]);
    expect(named(d)).toContain('head:230:order');
    const heads = d.labelled.filter((l) => l.curve.quantity === 'head').sort((a, b) => b.value - a.value);
    expect(heads.map((l) => l.confidence)).toEqual([1, 0.8, 1]);
  });

  it('asks instead of guessing when a head curve has no label and the sheet names fewer diameters than curves', () => {
    const h = headPanel([250, 230, 210]);
    const labels = [labelOn(h, 0.6 * end(250), head(250)(0.6 * end(250)), '250 mm'), labelOn(h, 0.6 * end(210), head(210)(0.6 * end(210)), '210 mm')];
    const { paths, text } = syntheticSheet([h], labels);
    const d = detectSheet(text, paths);
    expect(named(d)).toEqual(['head:210:label', 'head:250:label']);
    expect(d.questions).toHaveLength(1);
    expect(d.questions[0]).toMatch(/has no label, and the sheet names 2 diameters for 3 head curves/);
  });

  it('asks when the labels contradict the order of the curves (a larger impeller with less head)', () => {
    const h = headPanel([250, 210]);
    const labels = [labelOn(h, 0.6 * end(250), head(250)(0.6 * end(250)), '210 mm'), labelOn(h, 0.6 * end(210), head(210)(0.6 * end(210)), '250 mm')];
    const { paths, text } = syntheticSheet([h], labels);
    const d = detectSheet(text, paths);
    expect(named(d)).toEqual([]);
    expect(d.questions.some((q) => /do not fall in the order/.test(q))).toBe(true);
  });

  it('asks about a frame whose tick labels do not read as an axis, and keeps the rest', () => {
    const d = withPowerTicks(['0', '13', '7', '31', '40']);
    expect(d.panels.map((k) => k.quantity)).toEqual(['head']);
    expect(d.questions.some((q) => /no tick labels that read as an evenly spaced/.test(q))).toBe(true);
    expect(named(d)).toEqual(['head:230:label', 'head:250:label']);
  });

  it('calibrates a frame from its tick labels when one of them is odd, and asks about that one', () => {
    const d = withPowerTicks(['0', '10', '20', '33', '40']);
    expect(d.panels.map((k) => k.quantity)).toEqual(['head', 'power']);
    const power = d.panels[1]!;
    expect(power.proposal.y.labels.map((l) => l.value)).toEqual([40, 20, 10, 0]);
    expect(power.confidence).toBeLessThan(0.7);
    expect(d.questions.some((q) => /"33" does not fit/.test(q))).toBe(true);
    expect(named(d)).toContain('power:250:end-flow');
  });

  it('reads tick labels printed with too few digits when one axis explains them all, and asks when two could', () => {
    const h = headPanel([250, 230]);
    const labels = [250, 230].map((d) => labelOn(h, 0.6 * end(d), head(d)(0.6 * end(d)), `${d} mm`));
    // Ticks at 0, 2.5, 5, 7.5, 10 printed as 0, 3, 5, 8, 10: only 0, 5, 10 lie on a line that the others round from.
    const small = { ...powerPanel([250, 230], ['0', '3', '5', '8', '10']), y: { min: 0, max: 10, step: 2.5 }, curves: [] };
    const one = syntheticSheet([h, small], labels);
    const d = detectSheet(one.text, one.paths);
    expect(d.panels.map((k) => k.quantity)).toEqual(['head', 'power']);
    expect(d.panels[1]!.proposal.y.labels.map((l) => l.value)).toEqual([10, 5, 0]);
    expect(d.questions).toEqual([]);
    // Up to 12.5 printed 13: 0, 5, 10 and 3, 8, 13 each explain the others as rounded; the axis is not read.
    const both = { ...small, y: { min: 0, max: 12.5, step: 2.5 }, yTexts: ['0', '3', '5', '8', '10', '13'] };
    const two = syntheticSheet([h, both], labels);
    const d2 = detectSheet(two.text, two.paths);
    expect(d2.panels.map((k) => k.quantity)).toEqual(['head']);
    expect(d2.questions.some((q) => /no tick labels that read/.test(q))).toBe(true);
  });

  it('reads iso levels from "%" labels, infers a level only where branch and step are certain, and asks about the rest', () => {
    const h = headPanel([250, 210]);
    // Invented iso-lines: straight lines from the 210 mm curve up to the 250 mm curve at rising flows.
    const isoAt = (q: number) => ({ value: (x: number) => head(210)(q) + ((head(250)(q * 1.19) - head(210)(q)) * (x - q)) / (0.19 * q), end: q * 1.19, from: q, stroke: '#333333' });
    h.curves.push(isoAt(100), isoAt(130), isoAt(160), isoAt(190));
    const mid = (q: number) => 1.095 * q;
    const lab = (q: number, words: string) => labelOn(h, mid(q), isoAt(q).value(mid(q)), words);
    // 100 → 60 %, 130 → 65 %, 160 → (70 %, unlabelled, the top of what is labelled), 190 → unlabelled.
    const { paths, text } = syntheticSheet([h], [lab(100, '60%'), lab(130, '65%'), labelOn(h, 0.6 * end(250), head(250)(0.6 * end(250)), '250 mm'), labelOn(h, 0.6 * end(210), head(210)(0.6 * end(210)), '210 mm')]);
    const d = detectSheet(text, paths);
    const iso = d.labelled.filter((l) => l.curve.kind === 'iso').map((l) => [l.value, l.how]).sort();
    expect(iso).toEqual([
      [60, 'label'],
      [65, 'label'],
    ]);
    // Right of the highest label a line may be the next level up or the far branch: one question names both.
    expect(d.questions.filter((q) => /no "%" label/.test(q))).toEqual([expect.stringMatching(/^2 iso-lines on panel "head" .* levels read \(60, 65 %\)/)]);

    // Given every level drawn (the answer to that question), the lines take them in order of flow.
    const answered = detectSheet(text, paths, undefined, [60, 65, 70, 75]);
    expect(answered.labelled.filter((l) => l.curve.kind === 'iso').map((l) => [l.value, l.how]).sort()).toEqual([
      [60, 'label'],
      [65, 'label'],
      [70, 'order'],
      [75, 'order'],
    ]);
    expect(answered.questions).toEqual([]);
    // A list that disagrees with a label read on the sheet is not applied.
    expect(detectSheet(text, paths, undefined, [55, 60, 65, 70]).questions.some((q) => /no "%" label/.test(q))).toBe(true);

    // With 65, 70 and 75 % labelled, 65 and 70 are surely on the rising branch, one step apart,
    // so the line left of them is surely 60 %.
    const again = syntheticSheet([h], [lab(130, '65%'), lab(160, '70%'), lab(190, '75%'), labelOn(h, 0.6 * end(250), head(250)(0.6 * end(250)), '250 mm'), labelOn(h, 0.6 * end(210), head(210)(0.6 * end(210)), '210 mm')]);
    const d2 = detectSheet(again.text, again.paths);
    expect(d2.labelled.filter((l) => l.curve.kind === 'iso').map((l) => [l.value, l.how, l.confidence]).sort()).toEqual([
      [60, 'order', 0.7],
      [65, 'label', 1],
      [70, 'label', 1],
      [75, 'label', 1],
    ]);
    expect(d2.questions.filter((q) => /no "%" label/.test(q))).toHaveLength(0);
  });
});
