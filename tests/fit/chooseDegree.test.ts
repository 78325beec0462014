/**
 * Degree choice on invented pump-like curves (no real pump's data): flow in m³/s up to
 * 0.05 m³/s (180 m³/h), head in m, efficiency as a fraction, power in W. Noise is seeded.
 */
import { describe, expect, it } from 'vitest';
import { chooseDegree, fitCurve, formatQuantity } from '../../src/fit/chooseDegree.ts';
import { FitError } from '../../src/fit/fitError.ts';
import { evaluateUnchecked, linspace } from '../../src/fit/polynomial.ts';
import { interiorExtrema, lowestValue } from '../../src/fit/shape.ts';
import { PolynomialFit, type CurvePoint } from '../../src/model/curveset.ts';
import { seededNormal, seededRandom } from '../helpers/random.ts';

const Q_MAX = 0.05;
const flows = linspace(0, Q_MAX, 13);

/** Points of y(t), t = Q / Q_MAX, with relative or absolute seeded noise. */
function invented(y: (t: number) => number, seed: number, noise: { relative?: number; absolute?: number }, qs = flows): CurvePoint[] {
  const normal = seededNormal(seed);
  return qs.map((q) => {
    const v = y(q / Q_MAX);
    return [q, noise.relative !== undefined ? v * (1 + noise.relative * normal()) : v + (noise.absolute ?? 0) * normal()];
  });
}

/** Largest |fit − truth| over the domain, on 201 samples. */
function worstDeviation(fit: PolynomialFit, truth: (t: number) => number): number {
  return Math.max(...linspace(fit.domain[0], fit.domain[1], 201).map((q) => Math.abs(evaluateUnchecked(fit, q) - truth(q / Q_MAX))));
}

const quadraticHead = (t: number) => 52 - 20 * t * t;

describe('choosing the degree of a pump curve', () => {
  it('chooses degree 2 for a quadratic head curve with 0.3 % noise and says why with the figures', () => {
    const choice = chooseDegree(invented(quadraticHead, 1, { relative: 0.003 }), 'head', { tolerance: 0.21 });
    const { fit } = choice;
    expect(fit.degree).toBe(2);
    expect(choice.withinTolerance).toBe(true);
    const line = choice.candidates.find((c) => c.degree === 1);
    expect(fit.reason).toBe(`degree 2: RMS ${formatQuantity('head', fit.rms)} within the 0.21 m reading accuracy; degree 1 left ${formatQuantity('head', line?.fit?.rms ?? NaN)}.`);
    expect(fit.reason).toMatch(/^degree 2: RMS 0\.\d+ m within the 0\.21 m reading accuracy; degree 1 left \d\.\d m\.$/);
    // The fit stays within the 0.21 m reading accuracy of the invented truth everywhere.
    expect(worstDeviation(fit, quadraticHead)).toBeLessThan(0.21);
  });

  it('returns a complete PolynomialFit record that the schema accepts', () => {
    const fit = fitCurve(invented(quadraticHead, 1, { relative: 0.003 }), 'head', { tolerance: 0.21 });
    expect(PolynomialFit.parse(fit)).toEqual(fit);
    expect(Object.keys(fit).sort()).toEqual(['coefficients', 'condition', 'degree', 'domain', 'flow_scale', 'kind', 'max_residual', 'reason', 'rms', 'through_origin']);
    const largest = flows[flows.length - 1] as number;
    expect(fit.flow_scale).toBe(largest);
    expect(fit.domain).toEqual([0, largest]);
    expect(fit.through_origin).toBe(false);
    expect(fit.coefficients).toHaveLength(3);
    expect(fit.max_residual).toBeGreaterThanOrEqual(fit.rms);
    expect(fit.condition).toBeGreaterThan(1);
  });

  it('chooses degree 3 for a cubic head curve whose best quadratic misses by more than the accuracy', () => {
    const cubicHead = (t: number) => 50 - 2 * t - 6 * t * t - 20 * t ** 3;
    const choice = chooseDegree(invented(cubicHead, 2, { relative: 0.003 }), 'head', { tolerance: 0.2 });
    expect(choice.fit.degree).toBe(3);
    const quadratic = choice.candidates.find((c) => c.degree === 2)?.fit;
    expect(quadratic?.rms).toBeGreaterThan(0.2);
    expect(choice.fit.reason).toContain(`degree 3: RMS ${formatQuantity('head', choice.fit.rms)} within the 0.20 m reading accuracy; degree 2 left ${formatQuantity('head', quadratic?.rms ?? NaN)}`);
    expect(worstDeviation(choice.fit, cubicHead)).toBeLessThan(0.2);
  });

  it('passes over a degree within the accuracy when the next one removes a misfit larger than the accuracy', () => {
    // Invented cubic head curve with 0.05 m noise: the best quadratic has RMS 0.45 m, inside a
    // claimed 0.55 m accuracy, yet it misses the curve's ends by more than 0.55 m.
    const cubicHead = (t: number) => 50 - 2 * t - 6 * t * t - 20 * t ** 3;
    const choice = chooseDegree(invented(cubicHead, 9, { absolute: 0.05 }), 'head', { tolerance: 0.55 });
    const quadratic = choice.candidates.find((c) => c.degree === 2);
    expect(quadratic?.withinTolerance).toBe(true);
    expect(quadratic?.problems).toEqual([]);
    expect(choice.fit.degree).toBe(3);
    expect(choice.fit.reason).toMatch(
      /^degree 3: RMS 0\.050 m within the 0\.55 m reading accuracy; degree 2 \(RMS 0\.45 m\) left a systematic misfit: degree 3 improved it significantly and moved the curve by up to 0\.\d+ m\.$/,
    );
    // The cubic stays within 0.1 m of the invented curve; the quadratic would not.
    expect(worstDeviation(choice.fit, cubicHead)).toBeLessThan(0.1);
    expect(worstDeviation({ ...choice.fit, ...quadratic?.fit }, cubicHead)).toBeGreaterThan(0.55);
  });

  it('fits efficiency through the origin with a single maximum near the invented BEP and never below zero', () => {
    // Invented efficiency shape (not a polynomial): peak 0.78 at 75 % of the largest flow.
    const efficiency = (t: number) => 0.78 * Math.sin(((Math.PI / 2) * t) / 0.75) ** 1.3;
    const points = invented(efficiency, 3, { absolute: 0.003 }, flows.slice(1));
    const fit = fitCurve(points, 'efficiency', { tolerance: 0.005 });
    expect(fit.through_origin).toBe(true);
    expect(fit.coefficients[0]).toBe(0);
    expect(evaluateUnchecked(fit, 0)).toBe(0);
    const extrema = interiorExtrema(fit, fit.domain[0], fit.domain[1]);
    expect(extrema.map((e) => e.kind)).toEqual(['maximum']);
    // BEP flow within 5 % of the invented 0.0375 m³/s; peak within 0.005 of 0.78.
    expect(Math.abs((extrema[0]?.flow ?? 0) / (0.75 * Q_MAX) - 1)).toBeLessThan(0.05);
    expect(Math.abs((extrema[0]?.value ?? 0) - 0.78)).toBeLessThan(0.005);
    expect(lowestValue(fit, fit.domain[0], fit.domain[1]).value).toBeGreaterThanOrEqual(0);
    expect(fit.reason).toMatch(/^degree \d: RMS 0\.\d+ % within the 0\.50 % reading accuracy/);
  });

  it('does not choose a degree-5 fit that meets the accuracy by dipping between misread points', () => {
    // Invented flat head curve, 40 → 36 m, with points 2 and 3 misread by −0.4 m and +0.4 m.
    const misread = [0, -0.4, 0.4, 0, 0, 0, 0];
    const points = linspace(0, Q_MAX, 7).map((q, i): CurvePoint => [q, 40 - 4 * (q / Q_MAX) ** 2 + (misread[i] as number)]);
    const choice = chooseDegree(points, 'head', { tolerance: 0.15 });
    const quintic = choice.candidates.find((c) => c.degree === 5);
    // The premise: degree 5 is within the accuracy, and only its shape rules it out.
    expect(quintic?.withinTolerance).toBe(true);
    expect(quintic?.problems.some((p) => p.startsWith('a minimum at'))).toBe(true);
    expect(choice.fit.degree).not.toBe(5);
    expect(choice.fit.degree).toBe(2);
    expect(choice.withinTolerance).toBe(false);
    expect(choice.fit.reason).toMatch(
      /^no degree within the 0\.15 m reading accuracy has a plausible shape \(degree 5 reached RMS 0\.10 m but had a minimum at [\d.]+ m³\/s.*\); degree 2 chosen because degree 3 lowered the RMS only from 0\.21 m to 0\.21 m \(0 %, not significant at 95 %\)\.$/,
    );
  });

  it('when no degree meets the accuracy, stops where one more degree no longer helps, and says so', () => {
    // 0.3 % noise (about 0.14 m) against a claimed 0.05 m accuracy: nothing can meet it.
    const choice = chooseDegree(invented(quadraticHead, 1, { relative: 0.003 }), 'head', { tolerance: 0.05 });
    expect(choice.withinTolerance).toBe(false);
    expect(choice.fit.degree).toBe(2);
    const [two, three] = [2, 3].map((d) => choice.candidates.find((c) => c.degree === d)?.fit?.rms ?? NaN);
    expect(choice.fit.reason).toContain('no degree within the 0.050 m reading accuracy (best RMS');
    expect(choice.fit.reason).toContain(
      `degree 2 chosen because degree 3 lowered the RMS only from ${formatQuantity('head', two as number)} to ${formatQuantity('head', three as number)}`,
    );
    expect(choice.fit.reason).toMatch(/not significant at 95 %|less than the 10 % that counts/);
  });

  it('keeps the maximum of a drooping head curve whose points rise from shutoff', () => {
    // Invented drooping curve: 48 m at shutoff, peak 48.45 m at 15 % of the largest flow.
    const drooping = (t: number) => 48 + 6 * t - 20 * t * t;
    const fit = fitCurve(invented(drooping, 4, { absolute: 0.1 }), 'head', { tolerance: 0.2 });
    expect(fit.degree).toBe(2);
    const extrema = interiorExtrema(fit, 0, Q_MAX);
    expect(extrema.map((e) => e.kind)).toEqual(['maximum']);
    // Peak flow within 0.002 m³/s of the invented 0.0075 m³/s.
    expect(Math.abs((extrema[0]?.flow ?? 0) - 0.0075)).toBeLessThan(0.002);
  });

  it('accepts one minimum in an NPSHr curve and a plain power curve at low degree', () => {
    const npshr = fitCurve(invented((t) => 2.5 - 3 * t + 4.5 * t * t, 5, { absolute: 0.03 }, flows.slice(1)), 'npshr', { tolerance: 0.1 });
    expect(npshr.degree).toBe(2);
    expect(interiorExtrema(npshr, npshr.domain[0], npshr.domain[1]).map((e) => e.kind)).toEqual(['minimum']);
    expect(npshr.reason).toMatch(/^degree 2: RMS 0\.\d+ m within the 0\.10 m reading accuracy; degree 1 left 0\.\d+ m\.$/);
    const power = fitCurve(invented((t) => 9000 + 9000 * t - 2500 * t * t, 6, { absolute: 40 }), 'power', { tolerance: 70 });
    expect(power.degree).toBe(2);
    expect(power.reason).toMatch(/^degree 2: RMS \d\d W within the 70 W reading accuracy; degree 1 left \d{3} W\.$/);
  });

  it('tries no degree above maxDegree, and says when the cap decided', () => {
    // Accuracy 0.05 m is below the 0.3 % noise, so only the cap stops the search at 2.
    const choice = chooseDegree(invented(quadraticHead, 1, { relative: 0.003 }), 'head', { tolerance: 0.05, maxDegree: 2 });
    expect(choice.candidates.map((c) => c.degree)).toEqual([1, 2]);
    expect(choice.fit.degree).toBe(2);
    expect(choice.fit.reason).toMatch(/; degree 2 chosen because it is the highest degree asked for \(RMS 0\.\d+ m\)\.$/);
  });

  it('says when the number of points capped the degree', () => {
    // Five points of a cubic with ±1 µm alternating errors against a 1 nm accuracy: every added
    // degree up to 3 helps hugely, and 3 is the most that 5 points allow.
    const wobble = [1e-6, -1e-6, 1e-6, -1e-6, 1e-6];
    const points = linspace(0, Q_MAX, 5).map((q, i): CurvePoint => {
      const t = q / Q_MAX;
      return [q, 52 - 2 * t - 6 * t * t - 20 * t ** 3 + (wobble[i] as number)];
    });
    const choice = chooseDegree(points, 'head', { tolerance: 1e-9 });
    expect(choice.candidates.map((c) => c.degree)).toEqual([1, 2, 3]);
    expect(choice.fit.degree).toBe(3);
    expect(choice.fit.reason).toContain('degree 3 chosen because it is the highest degree the 5 points allow');
  });
});

describe('bad curve input', () => {
  const three: CurvePoint[] = [[0, 50], [0.01, 49], [0.02, 46]];
  it('names the points needed when there are too few', () => {
    expect(() => fitCurve([[0, 50], [0.01, 49]], 'head', { tolerance: 0.2 })).toThrow('The head curve has 2 points; at least 3 are needed for a fit.');
    expect(() => fitCurve([[0.01, 3]], 'npshr', { tolerance: 0.2 })).toThrow('The NPSHr curve has 1 point; at least 3 are needed for a fit.');
    expect(() => fitCurve([[0, 50], [0.01, 49], [0.01, 48.9], [0, 50.1]], 'head', { tolerance: 0.2 })).toThrow(
      'The head curve has 4 points but only 2 distinct flows; at least 3 are needed for a fit.',
    );
  });
  it('refuses non-finite numbers, negative flows and a non-positive accuracy with a sentence', () => {
    expect(() => fitCurve([[0, 50], [Number.NaN, 49], [0.02, 46]], 'head', { tolerance: 0.2 })).toThrow(
      'Point 2 of the head curve has a flow of NaN, not a finite number; correct or remove it.',
    );
    expect(() => fitCurve([[0, 50], [0.01, Infinity], [0.02, 46]], 'power', { tolerance: 0.2 })).toThrow(
      'Point 2 of the power curve has a value of Infinity, not a finite number; correct or remove it.',
    );
    expect(() => fitCurve([[-0.01, 50], [0.01, 49], [0.02, 46]], 'head', { tolerance: 0.2 })).toThrow(
      'Point 1 of the head curve has a negative flow (-0.01 m³/s); flows must be zero or positive.',
    );
    expect(() => fitCurve(three, 'head', { tolerance: 0 })).toThrow('The reading accuracy for the head curve must be a positive number in m; got 0.');
    expect(() => fitCurve(three, 'efficiency', { tolerance: 0.01, maxDegree: 1 })).toThrow('The highest degree for the efficiency curve must be at least 2; got 1.');
    expect(() => fitCurve(three, 'head', { tolerance: 0.2, maxDegree: 2.5 })).toThrow(FitError);
  });
  it('fits three points with a straight line, the only degree that leaves a degree of freedom', () => {
    const fit = fitCurve(three, 'head', { tolerance: 5 });
    expect(fit.degree).toBe(1);
  });
});

describe('noise about the size of the reading accuracy', () => {
  it('keeps the low degree when a higher one only follows the noise (partial F-test)', () => {
    // Invented quadratic NPSHr-like curve with uniform reading noise whose RMS is just above the stated accuracy.
    const random = seededRandom(31);
    const points = Array.from({ length: 15 }, (_, i) => {
      const q = 0.01 + (0.09 * i) / 14;
      return [q, 2 + 300 * q * q + (random() * 2 - 1) * 0.05] as [number, number];
    });
    let chosen = 0;
    let reasons = '';
    for (const tolerance of [0.024, 0.026, 0.028]) {
      const fit = fitCurve(points, 'npshr', { tolerance });
      chosen = Math.max(chosen, fit.degree);
      reasons += fit.reason;
    }
    expect(chosen).toBe(2);
    expect(reasons).toMatch(/degree 2/);
  });
});

describe('points that lie exactly on a drawn line (exactPoints)', () => {
  // An invented power curve P = ρ·g·Q·H/η drawn exactly (no reading noise): with H and η
  // polynomials, Q/η is rational, so no polynomial holds it exactly and a low degree leaves its
  // misfit where the curve ends. 150 points to 0.05 m³/s, largest about 22 kW.
  // η = 0.84·x(2 − x) with x = Q/Q_best and Q_best = Q_MAX/1.4, so Q/η stays finite at Q = 0.
  const power = (t: number) => {
    const x = 1.4 * t;
    const head = 52 - 20 * t * t;
    return (998 * 9.80665 * (Q_MAX / 1.4) * head) / (0.84 * (2 - x));
  };
  const drawn = invented(power, 0, {}, linspace(0, Q_MAX, 150));
  const largest = Math.max(...drawn.map((p) => p[1]));
  // The drawing's precision, 0.05 % of the largest value (src/digitize/takeoff.ts drawingPrecision).
  const precision = 0.0005 * largest;

  it('bounds the largest residual, not only the RMS, so the curve holds to its end', () => {
    const byRms = chooseDegree(drawn, 'power', { tolerance: precision });
    const exact = chooseDegree(drawn, 'power', { tolerance: precision, exactPoints: true });
    // The RMS rule takes a degree whose RMS is within the precision while a point misses by more.
    expect(byRms.fit.rms).toBeLessThanOrEqual(precision);
    expect(byRms.fit.max_residual).toBeGreaterThan(precision);
    expect(exact.withinTolerance).toBe(true);
    expect(exact.fit.degree).toBeGreaterThan(byRms.fit.degree);
    expect(exact.fit.max_residual).toBeLessThanOrEqual(precision);
    expect(worstDeviation(exact.fit, power)).toBeLessThanOrEqual(precision);
    expect(exact.fit.reason).toMatch(new RegExp(`^degree ${exact.fit.degree}: largest residual .* within the .* drawing precision; degree ${exact.fit.degree - 1} left a largest residual of `));
  });

  it('changes nothing for a curve a polynomial draws exactly', () => {
    const head = invented(quadraticHead, 0, {}, linspace(0, Q_MAX, 150));
    const fit = fitCurve(head, 'head', { tolerance: 0.0005 * 52, exactPoints: true });
    expect(fit.degree).toBe(2);
  });
});
