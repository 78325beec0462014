/**
 * The family chart: head, efficiency, power and NPSHr against flow for every diameter, one
 * above the other on a shared flow axis, in the chosen unit system. Curves are the fitted
 * polynomials inside their fitted range only — nothing extrapolated is drawn. An optional
 * duty view adds the system curve and the operating point of each diameter.
 */
import { bepDoubted } from '../../fit/checks/plausibility.ts';
import { h, svg } from '../dom/h.ts';
import { evaluateUnchecked, linspace } from '../../fit/polynomial.ts';
import type { CurveSet, Member, Quantity } from '../../model/curveset.ts';
import { chosenUnits, fromSI, niceLinearScale, unitOfQuantity, type CurveUnits, type UnitChoice } from '../../units/index.ts';
import { QUANTITY_INK } from '../canvas/overlay.ts';
import { choiceWords, curveLabelText, num, QUANTITY_NAMES, SAFETY_SENTENCE, speedWithShare, unitText } from './words.ts';
import { membersRatedFirst } from '../../duty/speed.ts';
import { spreadLabels } from '../geometry/labels.ts';

/** A curve label's width in the chart's label font (styles.css: .curve-label 10.5 px, speed labels bold), with a 3 px gap after it. */
function labelWidth(text: string, bold: boolean): number {
  return textWidth(text, `${bold ? '600 ' : ''}10.5px system-ui, sans-serif`, 10.5) + 3;
}
import { textWidth } from '../dom/textWidth.ts';

export type ChartUnits = CurveUnits;

/** The units a chart of `set` shows for a choice: the set's own (the default), or a preset's. */
export function chartUnits(set: Pick<CurveSet, 'display_units'>, choice: UnitChoice = 'own'): ChartUnits {
  return chosenUnits(set.display_units, choice);
}

/** SVG polyline points from pixel positions, to a tenth of a pixel. */
export function polylinePoints(points: readonly (readonly [number, number])[]): string {
  return points.map(([px, py]) => `${px.toFixed(1)},${py.toFixed(1)}`).join(' ');
}

/** Extra lines drawn on the head plot: the system curve and the operating points. */
export interface DutyOverlay {
  /** [flow m³/s, head m] points of the system curve. */
  system: [number, number][];
  /** Operating point per diameter, SI. */
  points: { label: string; flow: number; head: number; npshMarginOk?: boolean }[];
  /** Head curves at the speeds variable-speed options run at: [flow m³/s, head m] points, labelled with their speed. */
  curves?: { label: string; points: [number, number][] }[];
}

/** The chart's layout in SVG pixels: width, plot height, gap between plots, margins. */
const LAYOUT = { width: 560, plotHeight: 150, gap: 26, left: 62, right: 64, top: 22 } as const;
const { width: W, plotHeight: PLOT_H, gap: GAP, left: LEFT, right: RIGHT, top: TOP } = LAYOUT;
/** Numbers the plot clip paths, whose ids must be unique on the page (two charts may show at once). */
let clipCount = 0;

/** The curve picked out from a finding or a trace: its member by diameter (or by speed on a speed family), and its quantity. */
export interface ChartHighlight {
  diameter_m?: number | undefined;
  speed_rpm?: number | undefined;
  quantity?: Quantity;
}

export function familyChart(set: CurveSet, choice: UnitChoice = 'own', duty?: DutyOverlay | null, highlight?: ChartHighlight | null): HTMLElement {
  const u = chartUnits(set, choice);
  const quantities = (['head', 'efficiency', 'power', 'npshr'] as Quantity[]).filter((q) => set.members.some((m) => m.curves[q]?.fit));
  // Rated curve first: the largest diameter, or the fastest speed of a speed family.
  const members = membersRatedFirst(set);
  const bySpeed = set.family === 'speed';
  const domains = members.flatMap((m) => quantities.flatMap((q) => (m.curves[q]?.fit ? [m.curves[q]!.fit!.domain] : [])));
  if (domains.length === 0) return h('p', { class: 'hint' }, 'No fitted curves yet.');
  const qMax = Math.max(...domains.map((d) => d[1]), ...(duty?.points.map((p) => p.flow) ?? []));
  const plotW = W - LEFT - RIGHT;
  const xs = niceLinearScale(0, fromSI(qMax, u.flow), [LEFT, LEFT + plotW], 6);
  const x = (qSI: number) => xs.map(fromSI(qSI, u.flow));
  const height = TOP + quantities.length * (PLOT_H + GAP) + 24;
  const root = svg('svg', { viewBox: `0 0 ${W} ${height}`, class: 'family-chart', role: 'img', 'aria-label': `Family chart: ${quantities.map((q) => QUANTITY_NAMES[q]).join(', ')} against flow for ${members.length} ${bySpeed ? 'speeds' : 'diameters'}, in ${choiceWords(choice, u)}` });
  quantities.forEach((q, row) => {
    const top = TOP + row * (PLOT_H + GAP);
    const unit = unitOfQuantity(u, q);
    const values = members.flatMap((m) => {
      const fit = m.curves[q]?.fit;
      return fit ? linspace(fit.domain[0], fit.domain[1], 40).map((f) => fromSI(evaluateUnchecked(fit, f), unit)) : [];
    });
    if (q === 'head' && duty) values.push(...duty.system.map((p) => fromSI(p[1], unit)), ...(duty.curves ?? []).flatMap((c) => c.points.map((p) => fromSI(p[1], unit))));
    const ys = niceLinearScale(Math.min(0, ...values), Math.max(...values), [top + PLOT_H, top], 4);
    const y = (vSI: number) => ys.map(fromSI(vSI, unit));
    const g = svg('g', { class: `plot plot-${q}` });
    g.append(svg('rect', { x: LEFT, y: top, width: plotW, height: PLOT_H, class: 'plot-area' }));
    for (const t of ys.tickValues) {
      const yy = ys.map(t);
      g.append(svg('line', { x1: LEFT, x2: LEFT + plotW, y1: yy, y2: yy, class: 'grid' }));
      g.append(svg('text', { x: LEFT - 6, y: yy + 4, class: 'tick', 'text-anchor': 'end' }, num(t, 4)));
    }
    for (const t of xs.tickValues) {
      const xx = xs.map(t);
      g.append(svg('line', { x1: xx, x2: xx, y1: top, y2: top + PLOT_H, class: 'grid' }));
      if (row === quantities.length - 1) g.append(svg('text', { x: xx, y: top + PLOT_H + 14, class: 'tick', 'text-anchor': 'middle' }, num(t, 4)));
    }
    // Above the plot, clear of the top tick label at the left.
    g.append(svg('text', { x: LEFT, y: top - 7, class: 'axis-title' }, `${QUANTITY_NAMES[q]} [${unitText(unit.label || unit.token)}]`));
    const labels: { x: number; y: number; text: string; width: number; speed?: true }[] = [];
    members.forEach((m, k) => {
      const fit = m.curves[q]?.fit;
      if (!fit) return;
      const pts = polylinePoints(linspace(fit.domain[0], fit.domain[1], 60).map((f) => [x(f), y(evaluateUnchecked(fit, f))] as const));
      const same = bySpeed ? highlight?.speed_rpm === m.speed_rpm : highlight?.diameter_m === m.diameter_m;
      const emphasised = highlight && same && (!highlight.quantity || highlight.quantity === q);
      g.append(svg('polyline', { points: pts, class: `curve${emphasised ? ' emphasised' : ''}`, stroke: QUANTITY_INK[q], 'stroke-opacity': String(1 - k * 0.15) }, svg('title', null, `${QUANTITY_NAMES[q]}, ${memberName(set, m, u, true)}`)));
      const end = fit.domain[1];
      const text = memberName(set, m, u);
      labels.push({ x: x(end) + 4, y: y(evaluateUnchecked(fit, end)) + 4, text, width: labelWidth(text, false) });
    });
    // The curve a variable-speed option runs on is labelled with its speed among the drawn ones.
    for (const c of q === 'head' ? (duty?.curves ?? []) : []) {
      const end = c.points[c.points.length - 1];
      const text = c.label.replace(/^.*: /, '');
      if (end) labels.push({ x: x(end[0]) + 4, y: y(end[1]) + 4, text, width: labelWidth(text, true), speed: true });
    }
    if (q === 'head') {
      for (const m of members) {
        const bep = m.derived.bep;
        // A BEP the findings doubt (peak not captured, or past the head curve's end) is drawn dashed, and its title says so.
        const doubted = bep ? bepDoubted(set.findings, m) : false;
        if (bep) g.append(svg('circle', { cx: x(bep.flow_m3s), cy: y(bep.head_m), r: 3.5, class: doubted ? 'bep doubted' : 'bep' }, svg('title', null, `BEP of ${memberName(set, m, u, true)}: ${num(fromSI(bep.flow_m3s, u.flow))} ${unitText(u.flow.label)}, ${num(fromSI(bep.head_m, u.head))} ${u.head.label}, ${num(bep.efficiency * 100, 3)} %${doubted ? ' (not reliable: see the findings)' : ''}`)));
      }
      if (duty) {
        // The system curve runs on past the pump curves; it is cut at the plot's edges, clear of the curve labels.
        const clip = `family-plot-clip-${++clipCount}`;
        g.append(svg('clipPath', { id: clip }, svg('rect', { x: LEFT, y: top, width: plotW, height: PLOT_H })));
        g.append(svg('polyline', { points: polylinePoints(duty.system.map((p) => [x(p[0]), y(p[1])] as const)), class: 'system-curve', 'clip-path': `url(#${clip})` }));
        for (const c of duty.curves ?? []) {
          const end = c.points[c.points.length - 1];
          if (!end) continue;
          g.append(svg('polyline', { points: polylinePoints(c.points.map((p) => [x(p[0]), y(p[1])] as const)), class: 'speed-curve' }, svg('title', null, c.label)));
        }
        for (const p of duty.points) g.append(svg('rect', { x: x(p.flow) - 4, y: y(p.head) - 4, width: 8, height: 8, class: `op-point${p.npshMarginOk === false ? ' short' : ''}` }, svg('title', null, `Operating point ${p.label}: ${num(fromSI(p.flow, u.flow))} ${unitText(u.flow.label)}, ${num(fromSI(p.head, u.head))} ${u.head.label}`)));
      }
    }
    // Curve-end labels go on top (their halo keeps them legible over the system curve), clear of the
    // operating points, which often sit at a curve's end.
    const marks = q === 'head' && duty ? duty.points.map((p) => ({ x: x(p.flow) - 4, y: y(p.head) + 4, width: 8 })) : [];
    for (const l of spreadLabels(labels, 11, undefined, marks)) g.append(svg('text', { x: l.x, y: l.y, class: l.speed ? 'curve-label speed-curve-label' : 'curve-label' }, l.text));
    if (q === 'npshr' || q === 'power') {
      g.append(svg('text', { x: LEFT + plotW, y: top + PLOT_H + (row === quantities.length - 1 ? 28 : 12), class: 'caution-note', 'text-anchor': 'end' }, q === 'npshr' ? 'NPSHr: preliminary — check against certified data' : 'Power: preliminary — size motors from certified data'));
    }
    root.append(g);
  });
  root.append(svg('text', { x: LEFT + plotW / 2, y: height - 2, class: 'axis-title', 'text-anchor': 'middle' }, `Flow [${unitText(u.flow.label)}]`));
  return h('figure', { class: 'family' },
    root,
    h('figcaption', null, `${set.pump.name}${bySpeed ? `, one impeller drawn at ${members.length} speeds (rated ${num(set.speed_rpm, 6)} rpm)` : ` at ${num(set.speed_rpm, 6)} rpm`} — fitted curves over their captured range only. ${SAFETY_SENTENCE}`));
}

/**
 * A member as the chart labels it: its impeller diameter, or on a speed family its speed
 * ("1575 rpm"; with `share`, "1575 rpm (90 %)" of the set's rated speed).
 */
export function memberName(set: Pick<CurveSet, 'family' | 'speed_rpm'>, m: Member, u: ChartUnits, share = false): string {
  if (set.family === 'speed' || m.diameter_m === undefined) return share ? speedWithShare(m.speed_rpm, set.speed_rpm) : curveLabelText({ speed: m.speed_rpm }, '');
  return curveLabelText({ diameter: fromSI(m.diameter_m, u.diameter) }, u.diameter.token);
}
