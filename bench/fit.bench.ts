/**
 * Polynomial least squares: this project's fit (scaled abscissa, Householder QR, one
 * refinement step, plus condition number and standard errors) against ml-regression-polynomial
 * (normal equations on the raw abscissa). For each case: correct significant digits of the
 * coefficients against the reference values (the minimum over coefficients of
 * −log10 |relative error|) and the median time per fit.
 *
 * Reference values: NIST StRD Wampler1–5 certified coefficients; for the invented pump curves
 * (invented, noise-free) the coefficients that generated them.
 */
import { PolynomialRegression } from 'ml-regression-polynomial';
import { fitPolynomial, monomialCoefficients, monomialStandardErrors } from '../src/fit/polyfit.ts';

interface Case {
  name: string;
  xs: number[];
  ys: number[];
  degree: number;
  throughOrigin: boolean;
  /** Reference coefficients of plain powers of x, constant first (omitted through the origin). */
  reference: number[];
}

function wamplerCases(): Case[] {
  const xs = Array.from({ length: 21 }, (_, i) => i);
  const w1 = xs.map((v) => 1 + v + v ** 2 + v ** 3 + v ** 4 + v ** 5);
  const w2 = xs.map((v) => (100000 + 10000 * v + 1000 * v ** 2 + 100 * v ** 3 + 10 * v ** 4 + v ** 5) / 100000);
  const e = [759, -2048, 2048, -2048, 2523, -2048, 2048, -2048, 1838, -2048, 2048, -2048, 1838, -2048, 2048, -2048, 2523, -2048, 2048, -2048, 759];
  const ones = [1, 1, 1, 1, 1, 1];
  const noisy = (k: number) => w1.map((y, i) => y + k * (e[i] as number));
  return [
    { name: 'Wampler1', xs, ys: w1, degree: 5, throughOrigin: false, reference: ones },
    { name: 'Wampler2', xs, ys: w2, degree: 5, throughOrigin: false, reference: [1, 0.1, 0.01, 0.001, 1e-4, 1e-5] },
    { name: 'Wampler3', xs, ys: noisy(1), degree: 5, throughOrigin: false, reference: ones },
    { name: 'Wampler4', xs, ys: noisy(100), degree: 5, throughOrigin: false, reference: ones },
    { name: 'Wampler5', xs, ys: noisy(10000), degree: 5, throughOrigin: false, reference: ones },
  ];
}

function inventedCases(): Case[] {
  const poly = (c: number[]) => (x: number) => c.reduce((sum, a, i) => sum + a * x ** i, 0);
  // Invented head curve, m against m³/s (0…0.05 m³/s), cubic.
  const headQ = Array.from({ length: 13 }, (_, i) => (0.05 * i) / 12);
  const head = [52, 40, -9000, -150000];
  // The same kind of curve in gpm (0…800 gpm) and ft, quartic: large raw abscissae.
  const gpm = Array.from({ length: 15 }, (_, i) => (800 * i) / 14);
  const headFt = [170, 0.02, -1.1e-4, 2e-8, -1.5e-10];
  // Invented efficiency through the origin, fraction against m³/s, cubic.
  const etaQ = headQ.slice(1);
  const eta = [0, 40, -500, -2000];
  return [
    { name: 'head m, m³/s (inv.)', xs: headQ, ys: headQ.map(poly(head)), degree: 3, throughOrigin: false, reference: head },
    { name: 'head ft, gpm (inv.)', xs: gpm, ys: gpm.map(poly(headFt)), degree: 4, throughOrigin: false, reference: headFt },
    { name: 'efficiency, m³/s (inv.)', xs: etaQ, ys: etaQ.map(poly(eta)), degree: 3, throughOrigin: true, reference: eta.slice(1) },
  ];
}

function correctDigits(actual: readonly number[], reference: readonly number[]): number {
  const worst = Math.max(...reference.map((r, i) => Math.abs((actual[i] ?? NaN) - r) / Math.abs(r)));
  if (Number.isNaN(worst)) return NaN;
  return worst === 0 ? 17 : Math.min(17, -Math.log10(worst));
}

/** Largest |error| / standard deviation over the coefficients (data with residuals only). */
function errorOverSd(actual: readonly number[], c: Case): string {
  const fit = fitPolynomial(c.xs, c.ys, c.degree, { throughOrigin: c.throughOrigin });
  if (!(fit.residual_sd > 1e-6 * Math.max(...c.ys.map(Math.abs)))) return '-';
  const sd = monomialStandardErrors(fit).slice(c.throughOrigin ? 1 : 0);
  return Math.max(...c.reference.map((r, i) => Math.abs((actual[i] ?? NaN) - r) / (sd[i] as number))).toExponential(0);
}

function ours(c: Case): number[] {
  const all = monomialCoefficients(fitPolynomial(c.xs, c.ys, c.degree, { throughOrigin: c.throughOrigin }));
  return c.throughOrigin ? all.slice(1) : all;
}

function theirs(c: Case): number[] {
  // Coefficients come back in the order of `powers`: 0…degree, or 1…degree at intercept zero.
  return new PolynomialRegression(c.xs, c.ys, c.degree, { interceptAtZero: c.throughOrigin }).coefficients;
}

/**
 * Median time per call in microseconds of two functions, over `batches` batches of `perBatch`
 * calls each. Batches alternate between the two, so both see the same load on a shared machine.
 */
function medianMicroseconds(first: () => unknown, second: () => unknown, batches = 41, perBatch = 40): [number, number] {
  const times: [number[], number[]] = [[], []];
  for (let b = 0; b < batches; b++) {
    [first, second].forEach((run, k) => {
      const start = performance.now();
      for (let i = 0; i < perBatch; i++) run();
      times[k]?.push(((performance.now() - start) * 1000) / perBatch);
    });
  }
  const median = (list: number[]) => list.sort((p, q) => p - q)[Math.floor(list.length / 2)] as number;
  return [median(times[0]), median(times[1])];
}

function row(cells: (string | number)[], widths: number[]): string {
  return cells.map((c, i) => (i === 0 ? String(c).padEnd(widths[i] as number) : String(c).padStart(widths[i] as number))).join('  ');
}

export default async function fitBench(): Promise<void> {
  const widths = [24, 6, 11, 9, 8, 8, 8, 6, 6];
  const lines = [
    row(['case', 'degree', 'digits ours', 'digits ml', 'err/SD', 'err/SD', 'µs ours', 'µs ml', 'time ×'], widths),
    row(['', '', '', '', 'ours', 'ml', '', '', ''], widths),
    row(widths.map((w) => '-'.repeat(w)), widths),
  ];
  const cases = [...wamplerCases(), ...inventedCases()];
  // Warm up both code paths on every case before any timing.
  for (let i = 0; i < 300; i++) for (const c of cases) (ours(c), theirs(c));
  for (const c of cases) {
    const [fromOurs, fromTheirs] = [ours(c), theirs(c)];
    const digitsOurs = correctDigits(fromOurs, c.reference);
    const digitsTheirs = correctDigits(fromTheirs, c.reference);
    const [tOurs, tTheirs] = medianMicroseconds(() => ours(c), () => theirs(c));
    lines.push(
      row(
        [c.name, c.degree, digitsOurs.toFixed(1), digitsTheirs.toFixed(1), errorOverSd(fromOurs, c), errorOverSd(fromTheirs, c), tOurs.toFixed(1), tTheirs.toFixed(1), (tOurs / tTheirs).toFixed(1)],
        widths,
      ),
    );
  }
  process.stdout.write(
    [
      'Polynomial least squares: correct significant digits of the coefficients (min over coefficients,',
      '-log10 relative error; 17 = exact) and median time per fit. "ours" = fitPolynomial (scaled x, QR,',
      'refinement, condition number, standard errors); "ml" = ml-regression-polynomial 4.0.0 (normal',
      'equations on raw x). References: NIST StRD certified values; invented curves: generating coefficients.',
      '',
      ...lines,
      '',
      'err/SD: largest coefficient error divided by that coefficient\'s standard deviation (only where the',
      'data have residuals). Wampler3-5 add 1, 100 and 10000 times the same residual e to Wampler1. On raw',
      'integer x the normal equations form X^T e almost exactly (e is orthogonal to the columns), so their',
      'error stays that of Wampler1 (about 3e-7) and they score higher on Wampler5; the QR error grows with',
      'the residual but stays near 1e-13 of the standard deviations. Times come from a shared machine;',
      'compare the ratios, not the microseconds.',
      '',
    ].join('\n'),
  );
}
