/**
 * From captured data points to a fitted, checked curve set — the one function that the
 * points-table CLI, the take-off replay and the workbench all call.
 *
 * Points are SI (flow m³/s; head, NPSHr m; power W; efficiency fraction). Each curve is
 * fitted at the lowest degree that meets the reading accuracy without spurious wiggles
 * (chooseDegree.ts); a curve that cannot be fitted keeps its points and gets a `fail`
 * finding instead of stopping the build, so no captured work is thrown away.
 */
import { CURVESET_FORMAT, CURVESET_VERSION, CurveSet, QUANTITY_WORDS, type Curve, type CurvePoint, type DisplayUnits, type DrawnAs, type Finding, type Fluid, type Member, type Provenance, type Pump, type Quantity } from '../model/curveset.ts';
import { TOOL_NAME, TOOL_VERSION } from '../version.ts';
import { displayFor, makeFinding, runChecks, sortFindings } from './checks/index.ts';
import { chooseDegree } from './chooseDegree.ts';
import { efficiencyFromFamily } from './efficiencyFromFamily.ts';
import { deriveFigures } from './derived.ts';
import { familyFigures } from './checks/speedFigures.ts';
import { fitEvidenceFindings } from './checks/fitEvidence.ts';
import { UserError } from '../model/errors.ts';
import { checkBuildLimits, LimitError, MAX_MAGNITUDE_SI } from '../model/limits.ts';
import { valueText } from './checks/fitEvidence.ts';
import type { Display } from './checks/display.ts';

export interface MemberInput {
  diameter_m?: number;
  /** Speed of this member; defaults to the family's rated speed. */
  speed_rpm?: number;
  label?: string;
  points: Partial<Record<Quantity, CurvePoint[]>>;
  /**
   * Where each point came from, in the order of `points`: a row ("line 17") or a trace
   * ("trace h12"), so that a point the fit misses can be named as the user knows it.
   */
  sources?: Partial<Record<Quantity, PointSource[]>>;
  /** How the sheet drew each quantity (a take-off knows; a points table does not), kept in the curve. */
  drawnAs?: Partial<Record<Quantity, DrawnAs>>;
}

/** The origin of one point: `text` names it in a sentence ("line 17"); `trace` links the finding to a trace. */
export interface PointSource {
  text: string;
  trace?: string;
}

export interface BuildInput {
  pump: Pump;
  speed_rpm: number;
  family?: 'diameter' | 'speed';
  fluid: Fluid;
  display_units: DisplayUnits;
  provenance?: Partial<Omit<Provenance, 'tool'>>;
  members: MemberInput[];
  /**
   * Reading accuracy per quantity, SI (efficiency as a fraction). Defaults: 0.4 % of the
   * family's largest value for head, power and NPSHr, and 0.5 point for efficiency — about
   * what a careful reading of a printed sheet achieves (common practice).
   */
  readingAccuracy?: Partial<Record<Quantity, number>>;
  /**
   * Quantities whose points lie exactly on the drawn line (vector paths and their exact
   * crossings): their reading accuracy is the drawing's precision and bounds every point's
   * residual, not only the RMS (chooseDegree.ts, `exactPoints`).
   */
  exactQuantities?: readonly Quantity[];
}

const QUANTITY_ORDER: Quantity[] = ['head', 'efficiency', 'power', 'npshr'];
const NAMES = QUANTITY_WORDS;

function defaultAccuracy(members: MemberInput[], quantity: Quantity): number {
  if (quantity === 'efficiency') return 0.005;
  const largest = Math.max(0, ...members.flatMap((m) => (m.points[quantity] ?? []).map((p) => Math.abs(p[1]))));
  return largest > 0 ? 0.004 * largest : 1e-9;
}

export function buildCurveSet(input: BuildInput): CurveSet {
  const show = displayFor(input.display_units);
  const from = input.provenance?.points_file ? `The points table "${input.provenance.points_file}"` : input.provenance?.takeoff ? `The take-off "${input.provenance.takeoff}"` : 'The input';
  checkBuildLimits(input.members, from, (m) => (m.diameter_m !== undefined ? `diameter ${show.diameter(m.diameter_m)}` : `speed ${m.speed_rpm ?? input.speed_rpm} rpm`));
  checkMagnitudes(input.members, show);
  const fitFindings: Finding[] = [];
  const accuracy = Object.fromEntries(
    QUANTITY_ORDER.map((q) => [q, input.readingAccuracy?.[q] ?? defaultAccuracy(input.members, q)]),
  ) as Record<Quantity, number>;

  // An efficiency from iso-lines alone with too few points for a fit may take its shape from the
  // family below (efficiencyFromFamily.ts); its fit failure is said only if it does not.
  const isoTooFew = new Map<number, Finding>();
  const members: Member[] = input.members.map((m, memberIndex) => {
    const speed = m.speed_rpm ?? input.speed_rpm;
    const shell = { diameter_m: m.diameter_m, speed_rpm: speed };
    const curves: Member['curves'] = {};
    for (const quantity of QUANTITY_ORDER) {
      const raw = m.points[quantity];
      if (!raw || raw.length === 0) continue;
      const order = raw.map((_, i) => i).sort((a, b) => (raw[a] as CurvePoint)[0] - (raw[b] as CurvePoint)[0]);
      const points = order.map((i) => [...(raw[i] as CurvePoint)] as CurvePoint);
      const given = m.sources?.[quantity];
      const sources = given && given.length === raw.length ? order.map((i) => given[i] as PointSource) : undefined;
      const drawnAs = m.drawnAs?.[quantity];
      const curve: Curve = drawnAs ? { points, drawn_as: drawnAs } : { points };
      try {
        const choice = chooseDegree(points, quantity, { tolerance: accuracy[quantity], exactPoints: input.exactQuantities?.includes(quantity) ?? false });
        curve.fit = choice.fit;
        const refused = choice.withinTolerance ? undefined : choice.candidates.find((c) => c.degree > choice.fit.degree && c.fit && c.withinTolerance && c.problems.length > 0);
        const refusedForShape = refused?.fit ? { degree: refused.degree, rms: refused.fit.rms, problems: refused.problems } : undefined;
        fitFindings.push(...fitEvidenceFindings({ member: { ...shell, label: m.label }, quantity, points, fit: curve.fit, tolerance: accuracy[quantity], sources, refusedForShape }, show));
      } catch (error) {
        if (!(error instanceof Error) || error.name !== 'FitError') throw error;
        const failed = makeFinding({
          code: points.length < 3 ? 'fit.too-few-points' : 'fit.failed',
          severity: 'fail',
          member: shell,
          quantity,
          message: `The ${show.member({ ...shell, label: m.label })} ${NAMES[quantity]} curve could not be fitted: ${error.message} Capture more points along it.`,
          method: 'Least-squares polynomial fit (QR, scaled flow)',
          figures: { points: points.length },
        });
        if (quantity === 'efficiency' && drawnAs === 'iso-lines') isoTooFew.set(memberIndex, failed);
        else fitFindings.push(failed);
      }
      curves[quantity] = curve;
    }
    const member: Member = { speed_rpm: speed, curves, derived: {} };
    if (m.diameter_m !== undefined) member.diameter_m = m.diameter_m;
    if (m.label !== undefined) member.label = m.label;
    member.derived = deriveFigures(member);
    return member;
  });

  const family = input.family ?? (members.every((m) => m.diameter_m !== undefined) ? 'diameter' : 'speed');
  for (const borrowed of efficiencyFromFamily(members, family, show)) {
    const member = members[borrowed.index] as Member;
    (member.curves.efficiency as Curve).fit = borrowed.fit;
    member.derived = deriveFigures(member);
    isoTooFew.delete(borrowed.index);
    fitFindings.push(borrowed.finding);
  }
  fitFindings.push(...isoTooFew.values());
  const provenance: Provenance = {
    ...input.provenance,
    tool: { name: TOOL_NAME, version: TOOL_VERSION },
    created: input.provenance?.created ?? new Date().toISOString(),
  };
  const draft = {
    format: CURVESET_FORMAT,
    version: CURVESET_VERSION,
    pump: input.pump,
    speed_rpm: input.speed_rpm,
    family,
    fluid: input.fluid,
    provenance,
    display_units: input.display_units,
    members,
  } as const;

  // The POR band depends on the specific speed, which depends on the rated BEP: derive twice.
  const ns = familyFigures(draft).ns_us;
  if (ns !== undefined) for (const m of members) m.derived = deriveFigures(m, ns);

  const { findings, figures } = runChecks(draft);
  const set = { ...draft, figures, findings: sortFindings([...fitFindings, ...findings]) };
  const parsed = CurveSet.safeParse(set);
  if (parsed.success) return parsed.data;
  // Inputs within the limits should never get here; if they do, say so in the user's terms
  // (the curves of one member), not as a path inside the schema.
  const path = parsed.error.issues[0]?.path ?? [];
  const member = path[0] === 'members' ? members[Number(path[1])] : undefined;
  throw new UserError(
    `The points${member ? ` of ${show.member(member)}` : ''} give a curve figure that is not a finite number; check them for values far outside the range of the sheet.`,
    'unusable-points',
  );
}

/** Refuses a point beyond any pump (model/limits.ts), naming its row or trace, before a fit can overflow. */
function checkMagnitudes(members: readonly MemberInput[], show: Display): void {
  for (const m of members) {
    for (const quantity of QUANTITY_ORDER) {
      const points = m.points[quantity] ?? [];
      points.forEach(([q, y], i) => {
        const flowOff = !(Math.abs(q) <= MAX_MAGNITUDE_SI.flow);
        if (!flowOff && Math.abs(y) <= MAX_MAGNITUDE_SI[quantity]) return;
        const where = m.sources?.[quantity]?.[i]?.text;
        const who = `${where ? `${where[0]?.toUpperCase()}${where.slice(1)}: the` : 'The'} ${NAMES[quantity]} point of ${m.diameter_m !== undefined ? show.diameter(m.diameter_m) : `${m.speed_rpm ?? 'the rated'} rpm`}`;
        throw new LimitError(
          flowOff
            ? `${who} has a flow of ${show.flow(q)}, beyond any pump (limit ${show.flow(MAX_MAGNITUDE_SI.flow)}); check the number and the flow unit.`
            : `${who} has a value of ${valueText(show, quantity, y)}, beyond any pump (limit ${valueText(show, quantity, MAX_MAGNITUDE_SI[quantity])}); check the number and its unit.`,
        );
      });
    }
  }
}
