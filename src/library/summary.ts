/**
 * The searchable summary of a curve set: the columns the library keeps beside each entry
 * so that a text search or a duty prefilter runs in SQL without parsing any JSON.
 * Pure: a function of the curve set alone. All figures SI (m³/s, m, m, fraction, rpm).
 */
import type { CurveSet, Member, PolynomialFit } from '../model/curveset.ts';
import { evaluateUnchecked, linspace } from '../fit/polynomial.ts';

export interface CurveSetSummary {
  name: string;
  maker: string | null;
  model: string | null;
  size: string | null;
  pumpType: string | null;
  family: 'diameter' | 'speed';
  speedRpm: number;
  /** Impeller diameters of the members, ascending, m (empty for a speed family without diameters). */
  diametersM: number[];
  diameterMinM: number | null;
  diameterMaxM: number | null;
  memberCount: number;
  /** Envelope of the head curves over all members: flows from the lowest to the highest captured, m³/s. */
  flowMinM3s: number;
  flowMaxM3s: number;
  /** Lowest head anywhere on the head curves (usually the smallest member's end of curve) and highest (shutoff), m. */
  headMinM: number;
  headMaxM: number;
  /** BEP of the largest member (the rated diameter or speed). */
  bepFlowM3s: number | null;
  bepHeadM: number | null;
  bepEfficiency: number | null;
  /** Lower-case words of the pump's names, for text search. */
  searchText: string;
}

/** Samples per head curve when the envelope is taken from a fit. */
const ENVELOPE_SAMPLES = 41;

function headRange(member: Member): { qLo: number; qHi: number; hLo: number; hHi: number } | null {
  const head = member.curves.head;
  if (!head) return null;
  const fit: PolynomialFit | undefined = head.fit;
  const qs: number[] = [];
  const hs: number[] = [];
  if (fit) {
    const [lo, hi] = fit.domain;
    for (const q of linspace(lo, hi, ENVELOPE_SAMPLES)) {
      qs.push(q);
      hs.push(evaluateUnchecked(fit, q));
    }
  }
  for (const [q, h] of head.points) {
    qs.push(q);
    hs.push(h);
  }
  if (qs.length === 0) return null;
  return { qLo: Math.min(...qs), qHi: Math.max(...qs), hLo: Math.min(...hs), hHi: Math.max(...hs) };
}

/** The member with the largest diameter (or, failing that, the highest speed). */
export function ratedMember(set: CurveSet): Member {
  let best = set.members[0] as Member;
  for (const m of set.members) {
    const size = (x: Member) => x.diameter_m ?? 0;
    if (size(m) > size(best) || (size(m) === size(best) && m.speed_rpm > best.speed_rpm)) best = m;
  }
  return best;
}

export function summarize(set: CurveSet): CurveSetSummary {
  const diameters = set.members
    .map((m) => m.diameter_m)
    .filter((d): d is number => d !== undefined)
    .sort((a, b) => a - b);
  let qLo = Infinity;
  let qHi = -Infinity;
  let hLo = Infinity;
  let hHi = -Infinity;
  for (const m of set.members) {
    const r = headRange(m);
    if (!r) continue;
    qLo = Math.min(qLo, r.qLo);
    qHi = Math.max(qHi, r.qHi);
    hLo = Math.min(hLo, r.hLo);
    hHi = Math.max(hHi, r.hHi);
  }
  // A set without any head curve cannot meet a duty; an empty envelope keeps it out of every duty search.
  if (!Number.isFinite(qLo)) {
    qLo = 0; qHi = -1; hLo = 0; hHi = -1;
  }
  const bep = ratedMember(set).derived.bep;
  const p = set.pump;
  const words = [p.name, p.maker, p.model, p.size, p.type].filter((w): w is string => !!w);
  return {
    name: p.name,
    maker: p.maker ?? null,
    model: p.model ?? null,
    size: p.size ?? null,
    pumpType: p.type ?? null,
    family: set.family,
    speedRpm: set.speed_rpm,
    diametersM: diameters,
    diameterMinM: diameters[0] ?? null,
    diameterMaxM: diameters[diameters.length - 1] ?? null,
    memberCount: set.members.length,
    flowMinM3s: qLo,
    flowMaxM3s: qHi,
    headMinM: hLo,
    headMaxM: hHi,
    bepFlowM3s: bep?.flow_m3s ?? null,
    bepHeadM: bep?.head_m ?? null,
    bepEfficiency: bep?.efficiency ?? null,
    searchText: words.join(' ').toLowerCase(),
  };
}


/**
 * The curve set as the duty search needs it: fits, derived figures, pump, fluid and family,
 * without captured points and findings. Kept beside each entry so that a search parses a few
 * kilobytes per pump instead of the whole document.
 */
export function searchCopy(set: CurveSet): CurveSet {
  return {
    ...set,
    provenance: { tool: set.provenance.tool, created: set.provenance.created },
    members: set.members.map((m) => {
      const curves: Member['curves'] = {};
      for (const q of ['head', 'efficiency', 'power', 'npshr'] as const) {
        const c = m.curves[q];
        if (c) curves[q] = c.fit ? { points: [], fit: c.fit } : { points: [] };
      }
      return { ...m, curves };
    }),
    findings: [],
  };
}
