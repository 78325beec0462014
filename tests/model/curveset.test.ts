import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { readFileSync } from 'node:fs';
import { CURVESET_FORMAT, CURVESET_VERSION, CurveSet, type CurveSet as CurveSetT } from '../../src/model/curveset.ts';
import { parseCurveSetJson, stringifyCurveSet, CurveSetFormatError } from '../../src/model/curvesetIO.ts';

const finite = fc.double({ noNaN: true, noDefaultInfinity: true, min: -1e12, max: 1e12 }).map((v) => (Object.is(v, -0) ? 0 : v));
const positive = fc.double({ noNaN: true, noDefaultInfinity: true, min: 1e-9, max: 1e9 });
const nonNegative = fc.double({ noNaN: true, noDefaultInfinity: true, min: 0, max: 1e9 }).map((v) => (Object.is(v, -0) ? 0 : v));
const text = fc.string({ maxLength: 20 });
const opt = <T>(arb: fc.Arbitrary<T>) => fc.option(arb, { nil: undefined });

/** Drops keys whose value is undefined, as JSON does. */
function defined<T extends object>(o: T): T {
  return Object.fromEntries(Object.entries(o).filter(([, v]) => v !== undefined)) as T;
}

const fit = fc.record({
  kind: fc.constant('polynomial' as const),
  flow_scale: positive,
  coefficients: fc.array(finite, { minLength: 1, maxLength: 7 }),
  domain: fc.tuple(nonNegative, nonNegative).map(([a, b]) => (a <= b ? [a, b] : [b, a]) as [number, number]),
  degree: fc.integer({ min: 0, max: 6 }),
  through_origin: fc.boolean(),
  rms: nonNegative,
  max_residual: nonNegative,
  condition: nonNegative,
  reason: text,
});
const curve = fc.record({ points: fc.array(fc.tuple(finite, finite), { maxLength: 5 }), fit: opt(fit) }).map(defined);
const band = fc.record({ min_m3s: nonNegative, max_m3s: nonNegative, basis: text });
const member = fc
  .record({
    diameter_m: opt(positive),
    speed_rpm: positive,
    label: opt(text),
    curves: fc.record({ head: opt(curve), efficiency: opt(curve), power: opt(curve), npshr: opt(curve) }).map(defined),
    derived: fc
      .record({
        shutoff_head_m: opt(finite),
        bep: opt(fc.record({ flow_m3s: nonNegative, head_m: finite, efficiency: finite })),
        end_of_curve_m3s: opt(nonNegative),
        por: opt(band),
        aor: opt(band),
      })
      .map(defined),
  })
  .map(defined);
const finding = fc.record({
  id: text,
  code: text,
  severity: fc.constantFrom('note' as const, 'warn' as const, 'fail' as const),
  subject: fc.record({ diameter_m: opt(positive), quantity: opt(fc.constantFrom('head' as const, 'power' as const)), trace: opt(text) }).map(defined),
  message: text,
  method: text,
  figures: fc.dictionary(fc.string({ minLength: 1, maxLength: 8 }).filter((k) => k !== '__proto__'), finite, { maxKeys: 3 }),
});
const curveSet: fc.Arbitrary<CurveSetT> = fc
  .record({
    format: fc.constant(CURVESET_FORMAT),
    version: fc.constant(CURVESET_VERSION),
    pump: fc.record({ name: text, maker: opt(text), model: opt(text), stages: opt(fc.integer({ min: 1, max: 12 })) }).map(defined),
    speed_rpm: positive,
    family: fc.constantFrom('diameter' as const, 'speed' as const),
    fluid: fc.record({ name: text, density_kg_m3: positive, specific_gravity: positive, temperature_K: opt(positive) }).map(defined),
    provenance: fc
      .record({
        source: opt(fc.record({ file: text, sha256: fc.stringMatching(/^[0-9a-f]{64}$/), page: opt(fc.integer({ min: 1, max: 99 })) }).map(defined)),
        takeoff: opt(text),
        tool: fc.record({ name: text, version: text }),
        created: fc.date({ noInvalidDate: true }).map((d) => d.toISOString()),
      })
      .map(defined),
    display_units: fc.record({ flow: fc.constantFrom('gpm', 'm3/h', 'L/s'), head: fc.constantFrom('ft', 'm'), npsh: fc.constantFrom('ft', 'm'), power: fc.constantFrom('hp', 'kW', 'W'), diameter: fc.constantFrom('in', 'mm') }),
    members: fc.array(member, { minLength: 1, maxLength: 3 }),
    findings: fc.array(finding, { maxLength: 3 }),
  })
  .map(defined) as fc.Arbitrary<CurveSetT>;

describe('curve-set format', () => {
  it('JSON → model → JSON is lossless for any valid curve set (property test, 300 cases)', () => {
    fc.assert(
      fc.property(curveSet, (set) => {
        const json = JSON.stringify(set);
        const back = parseCurveSetJson(json);
        expect(back).toEqual(JSON.parse(json));
        expect(JSON.parse(stringifyCurveSet(back))).toEqual(JSON.parse(json));
      }),
      { numRuns: 300 },
    );
  });

  it('rejects JSON that is not a curve set with a sentence that says why', () => {
    expect(() => parseCurveSetJson('{"hello": 1}')).toThrow(/not a curve set: its "format" is missing/);
    expect(() => parseCurveSetJson('[1,2]')).toThrow(CurveSetFormatError);
    expect(() => parseCurveSetJson('{ not json')).toThrow(/not valid JSON/);
    expect(() => parseCurveSetJson('')).toThrow(/is empty/);
  });

  it('refuses a newer format version instead of guessing', () => {
    expect(() => parseCurveSetJson(JSON.stringify({ format: CURVESET_FORMAT, version: 99 }))).toThrow(/newer than this Pumpscribe reads/);
  });

  it('reads a version 1 file as version 2 (version 2 only added the optional drawn_as of a curve)', () => {
    const v2 = readFileSync('samples/demo/invented-si3-si.curveset.json', 'utf8');
    const v1 = v2.replace(/"version": 2,/, '"version": 1,');
    expect(v1).not.toBe(v2);
    expect(parseCurveSetJson(v1)).toEqual(parseCurveSetJson(v2));
    expect(parseCurveSetJson(v1).version).toBe(CURVESET_VERSION);
  });

  it('names the first invalid field', () => {
    const bad = { format: CURVESET_FORMAT, version: 1, pump: { name: 'x' }, speed_rpm: -5 };
    expect(() => parseCurveSetJson(JSON.stringify(bad))).toThrow(/speed_rpm/);
  });

  it('the zod model refuses non-finite numbers', () => {
    expect(CurveSet.shape.speed_rpm.safeParse(Infinity).success).toBe(false);
  });
});
