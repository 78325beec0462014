/**
 * The curve set: the neutral, normalised result for one pump at one speed
 * (`*.curveset.json`). Every number inside is SI — flow m³/s, head and NPSH m,
 * power W, diameter m, efficiency as a fraction 0…1, density kg/m³, temperature K,
 * kinematic viscosity m²/s, speed rpm. `display_units` only says how to show them.
 *
 * The published JSON Schema (schemas/curveset.schema.json) is generated from this file.
 */
import { z } from 'zod';
import { UNITS, type QuantityKind } from '../units/units.ts';

export const CURVESET_FORMAT = 'pumpscribe.curveset';
/**
 * Version 2 holds `drawn_as` on curves (how the sheet drew a curve) and the top-level `limits`
 * (minimum flow), both added while the version still said 1. The objects are strict, so an early
 * reader of version 1 refuses such a file by an unknown key; the version now tells it to update
 * instead. Version 1 files read on (model/curvesetIO.ts, MIGRATIONS).
 */
export const CURVESET_VERSION = 2;

// Every rule is written so that z.toJSONSchema carries it into the published schema:
// z.number() is finite in zod 4, .positive() becomes exclusiveMinimum, .nonnegative() minimum.
const finite = z.number();
const positive = z.number().positive();
const nonNegative = z.number().nonnegative();

/**
 * The one rule standard JSON Schema cannot state: a pair in ascending order. The schema
 * carries it as the keyword "x-ascending" (an annotation to validators that do not know it;
 * tests/model/schemaAgreement.test.ts teaches it to ajv).
 */
export const ASCENDING_KEYWORD = 'x-ascending';
const ascendingPair = z
  .tuple([nonNegative, nonNegative])
  .refine(([low, high]) => low <= high, 'must be in ascending order (low flow first)')
  .meta({ [ASCENDING_KEYWORD]: true });

/** Known spellings of a unit of one kind (canonical tokens and their aliases). */
function unitToken(kind: QuantityKind) {
  const known = UNITS.filter((u) => u.kind === kind).flatMap((u) => [u.token, ...u.aliases]);
  return z.enum([...new Set(known)] as [string, ...string[]]);
}

export const QUANTITIES = ['head', 'efficiency', 'power', 'npshr'] as const;
export const Quantity = z.enum(QUANTITIES);
export type Quantity = z.infer<typeof Quantity>;

/** Each quantity as a word inside a sentence ("the NPSHr curve"); the one map every message uses. */
export const QUANTITY_WORDS: Readonly<Record<Quantity, string>> = { head: 'head', efficiency: 'efficiency', power: 'power', npshr: 'NPSHr' };

/** A captured point: [flow m³/s, value in SI]. */
export const CurvePoint = z.tuple([finite, finite]);
export type CurvePoint = z.infer<typeof CurvePoint>;

/**
 * A least-squares polynomial in flow:
 *   y(Q) = Σ coefficients[i] · (Q / flow_scale)^i,   Q in m³/s, y in SI.
 * Valid only on `domain`; anything outside is extrapolation and must be flagged.
 */
export const PolynomialFit = z.strictObject({
  kind: z.literal('polynomial'),
  flow_scale: positive.describe('Q is divided by this (m³/s) before the powers are taken'),
  coefficients: z.array(finite).min(1),
  domain: ascendingPair.describe('flow range of the captured points, m³/s, low first'),
  degree: z.number().int().min(0),
  through_origin: z.boolean().describe('true when the constant term is held at zero (efficiency)'),
  rms: nonNegative.describe('root-mean-square residual, SI units of the quantity'),
  max_residual: nonNegative.describe('largest absolute residual, SI units of the quantity'),
  condition: nonNegative.describe('condition number of the scaled design matrix'),
  reason: z.string().describe('why this degree was chosen'),
});
export type PolynomialFit = z.infer<typeof PolynomialFit>;

/**
 * How the sheet drew a quantity for one member: as a curve of its own, as iso-lines whose
 * crossings with the head curve give points (iso-efficiency lines), or both. Checks that judge a
 * curve's drawn ends need it: points from iso-lines end at the last iso-line crossed, not at the
 * end of curve. Absent when not known (a points table, a file written before it was kept).
 */
export const DrawnAs = z.enum(['curve', 'iso-lines', 'both']);
export type DrawnAs = z.infer<typeof DrawnAs>;

export const Curve = z.strictObject({
  points: z.array(CurvePoint),
  fit: PolynomialFit.optional(),
  drawn_as: DrawnAs.optional().describe('how the sheet drew this curve: "curve", "iso-lines" (points where iso-lines cross the head curve) or "both"; absent when not known'),
});
export type Curve = z.infer<typeof Curve>;

export const Bep = z.strictObject({
  flow_m3s: nonNegative,
  head_m: finite,
  efficiency: finite,
});

export const OperatingBand = z.strictObject({
  min_m3s: nonNegative,
  max_m3s: nonNegative,
  basis: z.string().describe('where the band comes from, e.g. "ANSI/HI 9.6.3: 70–120 % of BEP flow"'),
});

export const Derived = z.strictObject({
  shutoff_head_m: finite.optional(),
  bep: Bep.optional(),
  end_of_curve_m3s: nonNegative.optional(),
  por: OperatingBand.optional(),
  aor: OperatingBand.optional(),
});
export type Derived = z.infer<typeof Derived>;

/** One impeller diameter (or one speed, for a variable-speed family). */
export const Member = z.strictObject({
  diameter_m: positive.optional(),
  speed_rpm: positive,
  label: z.string().optional(),
  curves: z.strictObject({
    head: Curve.optional(),
    efficiency: Curve.optional(),
    power: Curve.optional(),
    npshr: Curve.optional(),
  }),
  derived: Derived,
});
export type Member = z.infer<typeof Member>;

export const Severity = z.enum(['note', 'warn', 'fail']);
export type Severity = z.infer<typeof Severity>;

export const Finding = z.strictObject({
  id: z.string().describe('stable identifier: check code plus subject'),
  code: z.string().describe('which check produced it, e.g. "affinity.deviation"'),
  severity: Severity,
  subject: z.strictObject({
    diameter_m: positive.optional(),
    speed_rpm: positive.optional(),
    quantity: Quantity.optional(),
    trace: z.string().optional(),
  }),
  message: z.string(),
  method: z.string().describe('the method or standard the check relies on'),
  figures: z.record(z.string(), finite),
});
export type Finding = z.infer<typeof Finding>;

/** What names a pump beside its name: the one list of identity fields of every record that names a pump. */
export const pumpIdentityFields = {
  maker: z.string().optional(),
  model: z.string().optional(),
  size: z.string().optional(),
  type: z.string().optional(),
  stages: z.number().int().min(1).optional(),
  suction: z.enum(['single', 'double']).optional(),
};

export const Pump = z.strictObject({
  name: z.string(),
  ...pumpIdentityFields,
});
export type Pump = z.infer<typeof Pump>;

export const Fluid = z.strictObject({
  name: z.string(),
  density_kg_m3: positive,
  specific_gravity: positive,
  temperature_K: positive.optional(),
  viscosity_m2_s: positive.optional(),
});
export type Fluid = z.infer<typeof Fluid>;

export const Provenance = z.strictObject({
  source: z
    .strictObject({
      file: z.string(),
      sha256: z.string().regex(/^[0-9a-f]{64}$/, 'must be 64 lowercase hex digits'),
      page: z.number().int().min(1).optional(),
    })
    .optional(),
  takeoff: z.string().optional(),
  points_file: z.string().optional(),
  tool: z.strictObject({ name: z.string(), version: z.string() }),
  created: z.string().describe('ISO 8601 date and time'),
  notes: z.array(z.string()).optional(),
});
export type Provenance = z.infer<typeof Provenance>;

export const DisplayUnits = z.strictObject({
  flow: unitToken('flow'),
  head: unitToken('head'),
  npsh: unitToken('head'),
  power: unitToken('power'),
  diameter: unitToken('diameter'),
});
export type DisplayUnits = z.infer<typeof DisplayUnits>;

/** Family-wide figures at the rated (largest) diameter's BEP. */
export const Figures = z.strictObject({
  ns_us: finite.optional(),
  nq_si: finite.optional(),
  nss_us: finite.optional(),
  nss_si: finite.optional(),
});

/**
 * Operating limits drawn or stated on the sheet. The minimum continuous flow is a fixed flow, or
 * a line traced on the head panel ([flow m³/s, head m] points; the limit at a head is the line's
 * flow there, e.g. a line across the curves of a speed family).
 */
export const Limits = z.strictObject({
  min_flow: z
    .strictObject({
      flow_m3s: positive.optional().describe('minimum continuous flow, m³/s'),
      line: z.array(CurvePoint).min(2).optional().describe('the traced minimum-flow line, [flow m³/s, head m] points'),
      basis: z.string().describe('where the limit comes from, e.g. "line traced on the sheet"'),
    })
    .optional(),
});
export type Limits = z.infer<typeof Limits>;

export const CurveSet = z.strictObject({
  format: z.literal(CURVESET_FORMAT),
  version: z.literal(CURVESET_VERSION),
  pump: Pump,
  speed_rpm: positive.describe('rated speed of the family'),
  family: z.enum(['diameter', 'speed']),
  fluid: Fluid,
  provenance: Provenance,
  display_units: DisplayUnits,
  members: z.array(Member).min(1),
  figures: Figures.optional(),
  limits: Limits.optional(),
  findings: z.array(Finding),
});
export type CurveSet = z.infer<typeof CurveSet>;
