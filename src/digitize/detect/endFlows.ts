/**
 * Where each impeller's curves end on the flow axis, for naming the curves of the other panels
 * (efficiency, power, NPSHr) by the head curve that ends at the same flow.
 *
 * A head curve the tracer confirmed gives its own end flow ("sure"). A head curve the tracer did
 * not confirm may still have been found whole: its end is a reference only when the affinity
 * rule vouches for it. Affinity: flow in proportion to the impeller diameter at one speed, and to
 * the speed for one impeller, Q₂/Q₁ = D₂/D₁ (affinity laws, Karassik et al., Pump Handbook;
 * Lobanoff & Ross, Centrifugal Pumps; approximate for trims), so each curve's end lies at about
 * k·D with one k for the family when the sheet draws each trim to the same point of its own
 * curve (common practice, and a sheet that does not is caught below: its head ends do not keep
 * one k). A tolerance of a percent of the flow axis is allowed.
 *
 * The rule is taken as this sheet's only when it holds for the head curves' own ends: at least
 * two of them agree on one k within the tolerance, one of them sure, or three agree. Then a
 * named value whose head curve is unsure but agrees is "vouched", and a value with no head curve
 * end of its own (its head curve unsure and off the rule, or not found, its value given) is
 * "predicted" at k·D; a sure head whose end is off a rule that three others keep has both its own
 * end and k·D. Otherwise only the sure ends are references. A value may thus have two references:
 * a curve is matched to a value by the nearer of them.
 *
 * Pure: numbers in, numbers out. Flows in the panel's flow unit, values as named (mm, in, rpm).
 */

export interface HeadEnd {
  /** The diameter (or speed) the head curve is named by. */
  value: number;
  /** Flow at the head curve's far end. */
  end: number;
  /** True when the tracer confirmed the head curve (confidence 0.5 or more). */
  sure: boolean;
}

export interface EndReference {
  value: number;
  end: number;
  how: 'sure' | 'vouched' | 'predicted';
}

/** Ends within this share of the flow span agree with the affinity rule (common practice: see above). */
export const END_AFFINITY_SHARE = 0.01;

/**
 * The reference end flow of each value: the sure heads' ends, and, where the head curves' own
 * ends keep the affinity rule, the ends of the unsure heads that keep it and k·D for the rest of
 * `values` (the values named or given). `span` is the flow axis's span.
 */
export function endReferences(heads: readonly HeadEnd[], values: readonly number[], span: number): EndReference[] {
  const out: EndReference[] = [];
  const usable = heads.filter((h) => h.value > 0 && Number.isFinite(h.end) && h.end > 0);
  for (const h of usable) if (h.sure && !out.some((o) => o.value === h.value)) out.push({ value: h.value, end: h.end, how: 'sure' });
  const rule = affinityRule(usable, span);
  if (!rule) return out;
  const tol = END_AFFINITY_SHARE * span;
  const all = [...new Set([...usable.map((h) => h.value), ...values.filter((v) => v > 0)])];
  for (const v of all) {
    const own = out.find((o) => o.value === v);
    // A sure head off the rule kept by three others: its end as measured, and where the rule puts it
    // (the finder may have lost or overrun that line's end while the tracer agreed elsewhere).
    if (own) {
      if (rule.members.length >= 3 && Math.abs(own.end - rule.k * v) > tol) out.push({ value: v, end: rule.k * v, how: 'predicted' });
      continue;
    }
    const head = usable.find((h) => h.value === v && Math.abs(h.end - rule.k * v) <= tol);
    out.push(head ? { value: v, end: head.end, how: 'vouched' } : { value: v, end: rule.k * v, how: 'predicted' });
  }
  return out;
}

/**
 * The one k (end flow per unit of value) that the most head ends keep within the tolerance, or
 * null when fewer than two keep it with one of them sure and fewer than three keep it at all,
 * or when two different groups are as large.
 */
export function affinityRule(heads: readonly HeadEnd[], span: number): { k: number; members: HeadEnd[] } | null {
  const tol = END_AFFINITY_SHARE * span;
  if (!(tol > 0)) return null;
  // One value, one end: two curves of one name are no evidence for each other.
  const distinct = heads.filter((h, i) => heads.findIndex((o) => o.value === h.value) === i && heads.filter((o) => o.value === h.value).length === 1);
  let best: { k: number; members: HeadEnd[] } | null = null;
  let tie = false;
  for (const h of distinct) {
    let members = distinct.filter((o) => Math.abs((h.end / h.value) * o.value - o.end) <= tol);
    // The k of the group (least squares through the origin), and the group it keeps.
    const fit = (m: readonly HeadEnd[]) => m.reduce((a, o) => a + o.end * o.value, 0) / m.reduce((a, o) => a + o.value * o.value, 0);
    const k = fit(members);
    members = distinct.filter((o) => Math.abs(k * o.value - o.end) <= tol);
    if (members.length === 0) continue;
    const key = (m: readonly HeadEnd[]) => m.map((o) => o.value).sort((a, b) => a - b).join();
    if (!best || members.length > best.members.length) [best, tie] = [{ k: fit(members), members }, false];
    else if (members.length === best.members.length && key(members) !== key(best.members)) tie = true;
  }
  if (!best || tie) return null;
  const sure = best.members.filter((m) => m.sure).length;
  if (!((best.members.length >= 2 && sure >= 1) || best.members.length >= 3)) return null;
  return best;
}

/** Within this share of the flow span a curve's end is at a reference's end. */
export const END_MATCH_SHARE = 0.02;
/** Within this share a tracer's end (not the line found's) is at a reference's end: closer, as it names only an unsure proposal. */
export const TRACED_END_SHARE = 0.008;

/**
 * The value whose reference lies nearest `end` (each value by the nearer of its references), and
 * whether it is the only one: within `near` of the span, the next value over twice as far plus
 * 0.5 % of the span.
 */
export function endMatch(references: readonly EndReference[], end: number, span: number, near: number): { best?: { r: EndReference; d: number }; sole: boolean } {
  const ranked = references
    .map((r) => ({ r, d: Math.abs(r.end - end) / span }))
    .sort((a, b) => a.d - b.d)
    .filter((k, i, all) => all.findIndex((o) => o.r.value === k.r.value) === i);
  const best = ranked[0];
  const next = ranked[1];
  return { ...(best ? { best } : {}), sole: !!best && best.d <= near && !(next && next.d < 2 * best.d + 0.005) };
}

export interface EndCurve {
  /** Curves of one group (a panel) never share a name. */
  group: unknown;
  /** Flow at the far end of the line found, and of the tracer's line. */
  end: number;
  tracedEnd: number;
  /** The flow axis's span. */
  span: number;
  /** A name the curve has already (named otherwise): kept, and taken on its group. */
  value?: number;
}

export interface EndName {
  value: number;
  /** 'end flow': the line found ends there; 'traced end': only the tracer's line does (an unsure proposal). */
  by: 'end flow' | 'traced end';
  reference: EndReference;
  /** Distance to the reference, share of the span. */
  share: number;
}

/**
 * Names of curves by where they end: first every curve whose line found ends at exactly one
 * value's reference; then, for the rest, where the tracer's line ends clearly elsewhere (over
 * END_MATCH_SHARE away) and closely (TRACED_END_SHARE) at exactly one value's reference that no
 * curve of the group has taken. The line found may overrun the curve's end (into a label, along
 * another line) or stop short where the tracer carried on; a piece of a line whose tracer ran on
 * along the whole line would take that line's name, hence the value must be free. Null: unnamed.
 */
export function nameByEnds(curves: readonly EndCurve[], references: readonly EndReference[]): (EndName | null)[] {
  const out: (EndName | null)[] = curves.map((c) => {
    if (c.value !== undefined) return null;
    const { best, sole } = endMatch(references, c.end, c.span, END_MATCH_SHARE);
    return best && sole ? { value: best.r.value, by: 'end flow', reference: best.r, share: best.d } : null;
  });
  const valueOf = (i: number) => curves[i]?.value ?? out[i]?.value;
  curves.forEach((c, i) => {
    if (c.value !== undefined || out[i] || !Number.isFinite(c.tracedEnd) || !(Math.abs(c.tracedEnd - c.end) > END_MATCH_SHARE * c.span)) return;
    const { best, sole } = endMatch(references, c.tracedEnd, c.span, TRACED_END_SHARE);
    if (!best || !sole || curves.some((o, j) => j !== i && o.group === c.group && valueOf(j) === best.r.value)) return;
    out[i] = { value: best.r.value, by: 'traced end', reference: best.r, share: best.d };
  });
  return out;
}

/**
 * The affinity rule read from the other panels' curves when the head curves' ends do not give it:
 * a panel (power, NPSHr, efficiency) that holds exactly one curve per value, whose ends taken
 * largest to smallest lie at k·v for the values taken largest to smallest, every one within
 * `END_AFFINITY_SHARE` of the span, keeps the rule with that k. It is this sheet's rule only when
 * it is vouched for twice over: two panels keep it with one k (within the tolerance at the
 * largest value), or one panel keeps it with three values or more and a head curve's end (sure or
 * not) lies at k·v for its value. Null otherwise. The same law as `affinityRule` (Q ∝ D; Q ∝ n for
 * a speed family), read where the head curves were found short, run on or not at all.
 *
 * `panels` holds each panel's curve ends (the lines found), `values` every value named or given.
 */
export function panelEndRule(panels: readonly (readonly number[])[], heads: readonly HeadEnd[], values: readonly number[], span: number): number | null {
  const tol = END_AFFINITY_SHARE * span;
  const sorted = [...new Set(values.filter((v) => v > 0))].sort((a, b) => b - a);
  if (!(tol > 0) || sorted.length < 2) return null;
  const kept: number[] = [];
  for (const ends of panels) {
    if (ends.length !== sorted.length || !ends.every((e) => Number.isFinite(e) && e > 0)) continue;
    const byEnd = [...ends].sort((a, b) => b - a);
    // The k through the origin (least squares), then every end held to it.
    const k = byEnd.reduce((a, e, i) => a + e * (sorted[i] as number), 0) / sorted.reduce((a, v) => a + v * v, 0);
    if (byEnd.every((e, i) => Math.abs(k * (sorted[i] as number) - e) <= tol)) kept.push(k);
  }
  const top = sorted[0] as number;
  for (const [i, k] of kept.entries()) {
    const twice = kept.some((o, j) => j !== i && Math.abs((o - k) * top) <= tol);
    const byHead = sorted.length >= 3 && heads.some((h) => Number.isFinite(h.end) && Math.abs(k * h.value - h.end) <= tol);
    if (twice || byHead) return k;
  }
  return null;
}

/**
 * The references with the rule of `panelEndRule` added: for each value, k·v ("predicted") unless
 * one of its references already lies there within `END_AFFINITY_SHARE` of the span. A value's
 * own end off the rule stays beside it (a curve is matched by the nearer of a value's references).
 */
export function withPanelRule(references: readonly EndReference[], k: number, values: readonly number[], span: number): EndReference[] {
  const tol = END_AFFINITY_SHARE * span;
  const out = [...references];
  for (const v of new Set(values.filter((x) => x > 0))) {
    if (!out.some((r) => r.value === v && Math.abs(r.end - k * v) <= tol)) out.push({ value: v, end: k * v, how: 'predicted' });
  }
  return out;
}
