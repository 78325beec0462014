/**
 * Labels assigned to curves. A diameter (or speed) label sits on its curve (centred on it,
 * often on a paper-coloured box) or beside the curve's end; an iso label ("75 %") sits on its
 * iso-line. Each label goes to the nearest curve when that curve is clearly nearer than any
 * other; otherwise the label is ambiguous and becomes a question.
 *
 * Where labels are missing the rules of the trade fill in, and check, what the text leaves out:
 * - on a head panel, the larger impeller gives more head at every flow, so with as many
 *   diameters named on the sheet as head curves drawn, the curves ordered by head take the
 *   diameters ordered by size;
 * - one impeller's curves end at the same flow on every panel, so a power, NPSHr or efficiency
 *   curve takes the diameter of the head curve ending at its flow.
 * A label that disagrees with a rule is not overruled: the curve becomes a question.
 */
import { distanceToPolyline } from '../polyline.ts';
import type { SheetPoint } from '../points.ts';
import type { SheetText } from '../sheet.ts';
import type { FoundCurve } from './curves.ts';
import { yAt } from './curves.ts';
import { curveLabel, isoLabel, minFlowLabel, speedShareLabel, type CurveLabel } from './words.ts';
import { inferIsoLevels, levelsByOrder } from './isoLevels.ts';

export interface Labelled {
  curve: FoundCurve;
  /** Diameter or speed (in the label's unit), or the iso level in %. */
  value: number;
  how: 'label' | 'order' | 'end-flow';
  confidence: number;
}

export interface LabelResult {
  labelled: Labelled[];
  family: 'diameter' | 'speed';
  /** Unit of the curve labels ('mm', 'in' or 'rpm'), null when none was read. */
  unit: CurveLabel['unit'] | null;
  /** Lines across the curves labelled as the minimum continuous flow ("min. flow"): limits, not iso-lines. */
  minFlow: FoundCurve[];
  questions: string[];
}

export interface PlacedLabel {
  value: number;
  text: string;
  centre: SheetPoint;
  leftMid: SheetPoint;
  size: number;
}

const level = (t: SheetText) => Math.abs(Math.sin(t.angle)) < 0.2;

function place(t: SheetText, value: number): PlacedLabel {
  const y = t.at[1] - 0.35 * t.size;
  return { value, text: t.text.trim(), centre: [t.at[0] + t.width / 2, y] as unknown as SheetPoint, leftMid: [t.at[0], y] as unknown as SheetPoint, size: t.size };
}

/**
 * A label this many of its heights from a head curve's end, past it, may be that curve's, though
 * another curve runs under its letters: held only where that other curve ends at another head
 * curve's flow.
 */
const HEAD_END_REACH = 1.6;

/** Distance from a label to a curve: on the line, or beside its right end. */
function reach(label: PlacedLabel, curve: FoundCurve): number {
  const on = distanceToPolyline(curve.points, label.centre);
  const end = curve.points[curve.points.length - 1] as SheetPoint;
  const beside = Math.hypot(label.leftMid[0] - end[0], label.leftMid[1] - end[1]);
  return Math.min(on, beside);
}

/** The curve a label belongs to, or the candidates when two are about as near. */
function nearest(label: PlacedLabel, curves: readonly FoundCurve[]): { curve: FoundCurve | null; candidates: FoundCurve[] } {
  // A label written just past one curve's end names that curve, whatever else runs under its letters.
  const atEnd = curves.filter((c) => {
    const end = c.points[c.points.length - 1] as SheetPoint;
    return Math.hypot(label.leftMid[0] - end[0], label.leftMid[1] - end[1]) <= 1.0 * label.size && label.leftMid[0] >= end[0] - 0.2 * label.size;
  });
  if (atEnd.length === 1) return { curve: atEnd[0] as FoundCurve, candidates: atEnd };
  const ranked = curves.map((c) => ({ c, d: reach(label, c) })).sort((a, b) => a.d - b.d);
  const best = ranked[0];
  if (!best || best.d > 1.5 * label.size) return { curve: null, candidates: [] };
  const next = ranked[1];
  if (next && next.d - best.d < 0.4 * label.size) return { curve: null, candidates: ranked.filter((r) => r.d - best.d < 0.4 * label.size).map((r) => r.c) };
  return { curve: best.c, candidates: [best.c] };
}

/** Diameters or speeds the engineer gave for a sheet that does not print them (an answer to the detector's question). */
export interface GivenValues {
  family: 'diameter' | 'speed';
  /** In the take-off's diameter unit, or rpm. */
  values: readonly number[];
  unit: CurveLabel['unit'];
}

/**
 * Speeds printed as shares of the rated speed ("100 %", "90 %", "80 %" beside the curves of a
 * speed family). A "%" label is a speed only when it stands by a curve rather than on an
 * iso-line, the sheet prints no other curve label, and one of them reads 100 %: no pump is 100 %
 * efficient, so a 100 % label can only be the rated speed. Each becomes its speed in rpm from the
 * rated speed of the take-off (`pump.speed_rpm`). Without a 100 % label the "%" labels stay iso
 * levels, and the curves unnamed are asked for as usual.
 */
export function speedShares(
  shares: readonly { label: PlacedLabel; share: number }[],
  curves: readonly FoundCurve[],
  ratedRpm: number | undefined,
): { label: PlacedLabel; parsed: CurveLabel }[] {
  if (ratedRpm === undefined || !(ratedRpm > 0)) return [];
  const plain = curves.filter((c) => c.kind === 'curve');
  const isos = curves.filter((c) => c.kind === 'iso');
  const byCurve = shares.filter(({ label }) => {
    const { curve } = nearest(label, plain);
    if (!curve) return false;
    const onIso = Math.min(Infinity, ...isos.map((c) => distanceToPolyline(c.points, label.centre)));
    return reach(label, curve) + 0.4 * label.size < onIso;
  });
  if (!byCurve.some((s) => Math.abs(s.share - 100) < 1e-9)) return [];
  return byCurve.map(({ label, share }) => {
    const rpm = (share / 100) * ratedRpm;
    return { label: { ...label, value: rpm }, parsed: { kind: 'speed', value: rpm, unit: 'rpm' } };
  });
}

/** The level "%" labels of a page, placed, in the text's order. */
function placedIsoLabels(text: readonly SheetText[]): PlacedLabel[] {
  return text.flatMap((t) => {
    const iso = level(t) ? isoLabel(t.text) : null;
    return iso === null ? [] : [place(t, iso)];
  });
}

/**
 * The iso-line stubs (`sortCurves`) that carry a "%" label: the label's middle lies on the stub,
 * within `STUB_LABEL_REACH` of the label's height, and nearer it than any iso-line found. Each is
 * read as an iso-line (its label names its level); the others are asked about, one sentence each.
 */
export function labelledStubs(stubs: readonly FoundCurve[], curves: readonly FoundCurve[], text: readonly SheetText[], isoGiven?: readonly number[]): { read: FoundCurve[]; questions: string[] } {
  const labels = placedIsoLabels(text);
  const isos = curves.filter((c) => c.kind === 'iso');
  const read = stubs.filter((stub) =>
    labels.some((label) => {
      const d = distanceToPolyline(stub.points, label.centre);
      return d <= STUB_LABEL_REACH * label.size && isos.every((c) => c.panel !== stub.panel || distanceToPolyline(c.points, label.centre) > d);
    }),
  );
  // With the levels drawn given, a stub without a label is the end of an iso-line where it takes
  // its place in the order of the panel's iso-lines (`levelsByOrder`: no more lines than both
  // branches of every level) without moving any other line's level (vector detection bed seeds
  // 244 and 505: the right branch of the lowest level clipped by the last head curve's end, 30
  // units long, had been asked about).
  if (isoGiven && isoGiven.length > 0) {
    for (const stub of stubs) {
      if (read.includes(stub)) continue;
      const own = [...isos, ...read].filter((c) => c.panel === stub.panel && c.kind === 'iso');
      if (own.length === 0) continue;
      const before = levelsByOrder(own, isoGiven, new Map());
      const after = levelsByOrder([...own, stub], isoGiven, new Map());
      if (!before || !after) continue;
      if (own.some((c) => before.get(c) !== after.get(c))) continue;
      read.push(stub);
    }
  }
  const at = (p: SheetPoint) => `${p[0].toFixed(0)}, ${p[1].toFixed(0)}`;
  const questions = stubs
    .filter((s) => !read.includes(s))
    .map((s) => `A short line on panel "${s.panel.id}" from [${at(s.points[0] as SheetPoint)}] to [${at(s.points[s.points.length - 1] as SheetPoint)}] meets a head curve, too short to be read as an iso-line and with no "%" label on it; if it is the end of one, trace it by hand with its level (its crossing gives an efficiency point).`);
  return { read, questions };
}

/** How far from a stub, in label heights, the middle of the "%" label that names it may lie. */
const STUB_LABEL_REACH = 0.8;

export function assignLabels(curves: readonly FoundCurve[], text: readonly SheetText[], given?: GivenValues, isoGiven?: readonly number[], ratedRpm?: number): LabelResult {
  const questions: string[] = [];
  const curveLabels: { label: PlacedLabel; parsed: CurveLabel }[] = [];
  let isoLabels = placedIsoLabels(text);
  const shares: { label: PlacedLabel; share: number }[] = [];
  const minFlowLabels: PlacedLabel[] = [];
  for (const t of text) {
    if (!level(t)) continue;
    if (minFlowLabel(t.text)) minFlowLabels.push(place(t, NaN));
    const parsed = curveLabel(t.text);
    if (parsed) curveLabels.push({ label: place(t, parsed.value), parsed });
    const share = speedShareLabel(t.text);
    if (share !== null) shares.push({ label: place(t, share), share });
  }
  if (curveLabels.length === 0) {
    const speeds = speedShares(shares, curves, ratedRpm);
    curveLabels.push(...speeds);
    isoLabels = isoLabels.filter((l) => !speeds.some((k) => k.label.centre[0] === l.centre[0] && k.label.centre[1] === l.centre[1]));
  }
  // One family per sheet: the kind and unit most labels use.
  const kinds = new Map<string, number>();
  for (const l of curveLabels) kinds.set(l.parsed.unit, (kinds.get(l.parsed.unit) ?? 0) + 1);
  const unit = ([...kinds.entries()].sort((a, b) => b[1] - a[1])[0]?.[0] ?? given?.unit ?? null) as CurveLabel['unit'] | null;
  const family = unit === 'rpm' ? 'speed' : 'diameter';
  const familyLabels = curveLabels.filter((l) => l.parsed.unit === unit).map((l) => l.label);

  const direct = new Map<FoundCurve, Set<number>>();
  // The label that named each curve by place (the last, where two did: those are asked about).
  const placedBy = new Map<FoundCurve, PlacedLabel>();
  const plain = curves.filter((c) => c.kind === 'curve');
  // Labels about as near to two curves wait: the rules below may settle them.
  const ambiguous: { label: PlacedLabel; candidates: FoundCurve[] }[] = [];
  for (const label of familyLabels) {
    const { curve, candidates } = nearest(label, plain);
    if (curve) {
      direct.set(curve, (direct.get(curve) ?? new Set()).add(label.value));
      placedBy.set(curve, label);
    } else if (candidates.length > 1) ambiguous.push({ label, candidates });
  }
  const labelled = new Map<FoundCurve, Labelled>();
  for (const [curve, values] of direct) {
    if (values.size > 1) {
      questions.push(`The ${describe(curve)} carries two labels (${[...values].join(' and ')} ${unit}); which is its own?`);
      continue;
    }
    labelled.set(curve, { curve, value: [...values][0] as number, how: 'label', confidence: 1 });
  }

  let unnamedFamily = false;
  // Head panels: order by head at a flow all curves reach.
  // The values the sheet names, or those the engineer gave when it names none.
  const printed = [...new Set(familyLabels.map((l) => l.value))];
  const named = (printed.length === 0 && given && given.unit === unit ? [...new Set(given.values)] : printed).sort((a, b) => b - a);
  const panels = [...new Set(plain.map((c) => c.panel))];
  for (const panel of panels.filter((p) => p.quantity === 'head')) {
    const heads = plain.filter((c) => c.panel === panel);
    const x = 0.5 * Math.min(...heads.map((c) => (c.points[c.points.length - 1] as SheetPoint)[0])) + 0.5 * Math.max(...heads.map((c) => (c.points[0] as SheetPoint)[0]));
    const byHead = heads.map((c) => ({ c, y: yAt(c.points, x) ?? Infinity })).sort((a, b) => a.y - b.y).map((r) => r.c);
    // Labels must agree with the order: more head, larger impeller.
    const withLabels = byHead.filter((c) => labelled.has(c));
    const values = withLabels.map((c) => labelled.get(c)!.value);
    const ordered = values.every((v, i) => i === 0 || v < (values[i - 1] as number)); // a higher speed also gives more head
    if (!ordered) {
      questions.push(`The labels on panel "${panel.id}" (${values.join(', ')} ${unit}) do not fall in the order of the curves' heads; check which label names which curve.`);
      for (const c of withLabels) labelled.delete(c);
      continue;
    }
    if (named.length === byHead.length) {
      const clash = byHead.some((c, i) => labelled.has(c) && labelled.get(c)!.value !== named[i]);
      if (clash) {
        questions.push(`The labels on panel "${panel.id}" do not match the order of its ${byHead.length} curves by head; check which label names which curve.`);
        continue;
      }
      byHead.forEach((c, i) => {
        if (!labelled.has(c)) labelled.set(c, { curve: c, value: named[i] as number, how: 'order', confidence: 0.8 });
      });
    }
    const open = byHead.filter((k) => !labelled.has(k));
    if (open.length > 0 && named.length === 0) {
      // One question for the whole family: the answer names every curve by the order rule.
      unnamedFamily = true;
      questions.push(`The sheet names no ${family === 'speed' ? 'speeds' : 'impeller diameters'} for the ${byHead.length} head curves of panel "${panel.id}"; give them as "${family === 'speed' ? 'speeds' : 'diameters'}" in the take-off file (the curves take them in order of head, and the other panels' curves follow by the flow at which they end).`);
    } else {
      for (const c of open) questions.push(`The ${describe(c)} has no label, and the sheet names ${named.length} ${family === 'speed' ? 'speeds' : 'diameters'} for ${byHead.length} head curves; which is it?`);
    }
  }

  /** Whether `label` stands just past the end of a head curve named `value` (within HEAD_END_REACH label heights). */
  const labelOfHeadEnd = (label: PlacedLabel | undefined, value: number): boolean =>
    label !== undefined &&
    plain.some((h) => {
      if (h.panel.quantity !== 'head' || labelled.get(h)?.value !== value) return false;
      const end = h.points[h.points.length - 1] as SheetPoint;
      return Math.hypot(label.leftMid[0] - end[0], label.leftMid[1] - end[1]) <= HEAD_END_REACH * label.size && label.leftMid[0] >= end[0] - 0.2 * label.size;
    });

  // Other panels: the head curve ending at the same flow names the curve.
  const headEnds = plain
    .filter((c) => c.panel.quantity === 'head' && labelled.has(c))
    .map((c) => ({ value: labelled.get(c)!.value, flow: endFlow(c) }));
  for (const panel of panels.filter((p) => p.quantity !== 'head')) {
    const list = plain.filter((c) => c.panel === panel);
    const span = spanOf(panel);
    for (const c of list) {
      const q = endFlow(c);
      // A dashed or dotted line may stop up to one dash short of its end, never beyond it: the
      // curve belongs to the first head curve ending at or after its own end.
      const after = headEnds.filter((h) => h.flow >= q - 0.005 * span).sort((a, b) => a.flow - b.flow);
      const first = after[0];
      const clear = first !== undefined && first.flow - q <= 0.04 * span && (after[1] === undefined || after[1].flow - q > 2 * Math.max(first.flow - q, 0.005 * span));
      const byEnd = clear ? first.value : null;
      const own = labelled.get(c);
      if (own && byEnd !== null && own.value !== byEnd && own.how === 'label' && labelOfHeadEnd(placedBy.get(c), own.value)) {
        // The label stands just past the end of the head curve of its value, and this curve, which
        // runs under it, ends clearly at another head curve's flow: the label is the head curve's.
        labelled.set(c, { curve: c, value: byEnd, how: 'end-flow', confidence: 0.9 });
      } else if (own && byEnd !== null && own.value !== byEnd) {
        questions.push(`The ${describe(c)} is labelled ${own.value} ${unit} but ends at the flow of the ${byEnd} ${unit} head curve; which is it?`);
        labelled.delete(c);
      } else if (own && byEnd !== null) {
        labelled.set(c, { ...own, how: 'label', confidence: 1 });
      } else if (!own && byEnd !== null) {
        labelled.set(c, { curve: c, value: byEnd, how: 'end-flow', confidence: 0.9 });
      } else if (!own && !unnamedFamily) {
        questions.push(`The ${describe(c)} has no label and ends at no head curve's flow; which ${family === 'speed' ? 'speed' : 'diameter'} is it?`);
      }
    }
    // Two curves of one panel with one value: neither is sure.
    const seen = new Map<number, FoundCurve[]>();
    for (const c of list) if (labelled.has(c)) seen.set(labelled.get(c)!.value, [...(seen.get(labelled.get(c)!.value) ?? []), c]);
    for (const [value, cs] of seen) {
      if (cs.length < 2) continue;
      questions.push(`${cs.length} curves of panel "${panel.id}" come out as ${value} ${unit}; which one is it?`);
      for (const c of cs) labelled.delete(c);
    }
  }

  for (const { label, candidates } of ambiguous) {
    if (candidates.some((c) => labelled.get(c)?.value === label.value)) continue;
    questions.push(`The label "${label.text}" stands about as near to ${candidates.length} curves (${candidates.map(describe).join(', ')}); which one does it name?`);
  }

  // A line across the head curves labelled "min. flow" is the minimum-flow limit, not an iso-line.
  const minFlow = new Set<FoundCurve>();
  for (const label of minFlowLabels) {
    const { curve } = nearest(label, curves.filter((c) => c.kind === 'iso'));
    if (curve) minFlow.add(curve);
  }
  // Iso-lines: the "%" label on the line.
  const isos = curves.filter((c) => c.kind === 'iso' && !minFlow.has(c));
  const headFrames = [...new Set(curves.filter((c) => c.panel.quantity === 'head').map((c) => c.panel.frame))];
  const isoValues = new Map<FoundCurve, Set<number>>();
  const isoLabelsOn = new Map<FoundCurve, PlacedLabel[]>();
  for (const label of isoLabels) {
    const { curve, candidates } = nearest(label, isos);
    if (curve) {
      isoValues.set(curve, (isoValues.get(curve) ?? new Set()).add(label.value));
      isoLabelsOn.set(curve, [...(isoLabelsOn.get(curve) ?? []), label]);
    } else if (candidates.length > 1) questions.push(`The label "${label.text}" stands about as near to ${candidates.length} iso-lines; which one does it name?`);
    else if (isos.length > 0 && headFrames.some((f) => label.centre[0] > f[0] && label.centre[0] < f[2] && label.centre[1] > f[1] && label.centre[1] < f[3])) {
      // A level printed inside a head panel by no line found: its line was not found (a short
      // stub across the last head curve hides under its label), and that level's crossings there are missing.
      questions.push(`The label "${label.text}" at [${label.centre[0].toFixed(0)}, ${label.centre[1].toFixed(0)}] stands by no iso-line found: trace that line by hand if the sheet draws one (a short line may hide under its label).`);
    }
  }
  const knownIso = new Map<FoundCurve, number>();
  for (const c of isos) {
    const values = isoValues.get(c);
    if (values?.size === 1) knownIso.set(c, [...values][0] as number);
  }
  for (const [c, value] of knownIso) labelled.set(c, { curve: c, value, how: 'label', confidence: 1 });
  const settled: { curve: FoundCurve; level: number }[] = [];
  const byPanel = new Map<FoundCurve['panel'], FoundCurve[]>();
  for (const c of isos) byPanel.set(c.panel, [...(byPanel.get(c.panel) ?? []), c]);
  for (const [panel, list] of byPanel) {
    const inferred = inferIsoLevels(list, knownIso);
    const fromGiven = isoGiven ? levelsByOrder(list, isoGiven, knownIso) : null;
    const open: FoundCurve[] = [];
    for (const c of list) {
      if (knownIso.has(c)) continue;
      const v = inferred.get(c);
      const g = fromGiven?.get(c);
      const two = isoValues.get(c);
      if (two?.size) {
        // Two labels crowd one line (the other line's label printed close by): the level the
        // order gives (from the other lines' labels, or the levels given) settles it when it is
        // one of the two and the order does not say otherwise; else the engineer is asked.
        const pick = [g, v].find((k) => k !== undefined && two.has(k));
        if (pick !== undefined && (v === undefined || v === pick) && (g === undefined || g === pick)) {
          labelled.set(c, { curve: c, value: pick, how: 'order', confidence: 0.8 });
          settled.push({ curve: c, level: pick });
        } else questions.push(`The ${describe(c)} carries two levels (${[...two].join(' and ')} %); which is its own?`);
        continue;
      }
      if (v !== undefined && (g === undefined || g === v)) labelled.set(c, { curve: c, value: v, how: 'order', confidence: 0.7 });
      else if (v === undefined && g !== undefined) labelled.set(c, { curve: c, value: g, how: 'order', confidence: 0.8 });
      else open.push(c);
    }
    if (open.length > 0) {
      const read = [...new Set(knownIso.values())].sort((a, b) => a - b);
      const where = open.map((c) => `[${c.points[0]![0].toFixed(0)}, ${c.points[0]![1].toFixed(0)}]`).join(', ');
      questions.push(`${open.length} iso-line${open.length === 1 ? '' : 's'} on panel "${panel.id}" (starting at ${where}) carr${open.length === 1 ? 'ies' : 'y'} no "%" label, and the level does not follow from ${read.length ? `the levels read (${read.join(', ')} %)` : 'any level read'}; give every level drawn as "iso_levels" in the take-off file, or trace ${open.length === 1 ? 'it' : 'them'} by hand.`);
    }
  }
  // The other label by a line settled by order names a line of its own: one found near it with
  // that level, else a line the detector did not find (a short stub hidden under its label).
  for (const { curve, level } of settled) {
    for (const label of isoLabelsOn.get(curve) ?? []) {
      if (label.value === level) continue;
      const own = isos.some((k) => k !== curve && labelled.get(k)?.value === label.value && distanceToPolyline(k.points, label.centre) <= 2.5 * label.size);
      if (!own) questions.push(`The label "${label.text}" at [${label.centre[0].toFixed(0)}, ${label.centre[1].toFixed(0)}] stands by the ${describe(curve)}, whose level the order of the lines gives as ${level} %, and no iso-line found near it carries ${label.value} %: trace that line by hand if the sheet draws one (a short line may hide under its label).`);
    }
  }
  return { labelled: [...labelled.values()], family, unit, minFlow: [...minFlow], questions };
}

function spanOf(panel: FoundCurve['panel']): number {
  const xs = panel.proposal.x.labels.map((l) => l.value);
  return Math.max(...xs) - Math.min(...xs);
}

function endFlow(c: FoundCurve): number {
  return c.panel.proposal.calibration.toData(c.points[c.points.length - 1] as SheetPoint)[0];
}

export function describe(c: FoundCurve): string {
  const a = c.points[0] as SheetPoint;
  const b = c.points[c.points.length - 1] as SheetPoint;
  return `${c.kind === 'iso' ? 'iso-line' : `${c.quantity} curve`} on panel "${c.panel.id}" from [${a[0].toFixed(0)}, ${a[1].toFixed(0)}] to [${b[0].toFixed(0)}, ${b[1].toFixed(0)}]`;
}
