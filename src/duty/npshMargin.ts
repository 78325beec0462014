/**
 * Judging NPSHa against NPSH3 by the minimum margin guidance of ANSI/HI 9.6.1.
 *
 * NPSH3 (the NPSHr of a sheet) is the NPSH at which the first-stage head has already dropped 3 %
 * (HI 14.6 / ISO 9906): the pump is cavitating there. A margin above it is needed to protect
 * the impeller; how much depends on the application and the suction specific speed.
 *
 * Minimum margin ratio NPSHa/NPSH3 (ANSI/HI 9.6.1; summary published, check the standard):
 *   general (water, wastewater, power plant), Nss < 7500 US: 1.1 or 0.6 m, whichever is more;
 *                                             Nss ≥ 7500 US: 1.2 or 1.0 m, whichever is more;
 *   hydrocarbon, within the AOR:              1.1 or 1.0 m, whichever is more;
 *   building services, Nss < 7500 US:         above 1.0 throughout the AOR;
 *                      Nss ≥ 7500 US:         1.1 or 0.6 m, whichever is more.
 * When Nss is unknown the stricter (Nss ≥ 7500) line is used. Nss itself comes from the curve
 * set's family figures (src/fit/specificSpeed.ts).
 */
import { DutyError } from './errors.ts';

export const NPSH_APPLICATIONS = ['general', 'hydrocarbon', 'building-services'] as const;
export type NpshApplication = (typeof NPSH_APPLICATIONS)[number];

/** Suction specific speed (US units) above which the stricter margins apply. */
export const NSS_THRESHOLD_US = 7500;

export interface NpshMarginRule {
  application: NpshApplication;
  /** Minimum NPSHa/NPSH3. */
  ratio: number;
  /** Minimum NPSHa − NPSH3 [m]. */
  min_margin_m: number;
  /** Whether the Nss used was known or assumed to be high. */
  nss_us?: number;
  nss_assumed_high: boolean;
  basis: string;
}

export type NpshVerdict = 'meets-guidance' | 'below-guidance' | 'cavitation-expected';

export interface NpshJudgement {
  npsha_m: number;
  npsh3_m: number;
  /** NPSHa / NPSH3. */
  ratio: number;
  /** NPSHa − NPSH3 [m]. */
  margin_m: number;
  /** NPSHa the guidance asks for: max(ratio·NPSH3, NPSH3 + min margin) [m]. */
  required_npsha_m: number;
  verdict: NpshVerdict;
  rule: NpshMarginRule;
  message: string;
}

/** The margin rule for an application and suction specific speed (US units; undefined = unknown). */
export function npshMarginRule(application: NpshApplication, nss_us?: number): NpshMarginRule {
  if (!NPSH_APPLICATIONS.includes(application)) {
    throw new DutyError(`Unknown NPSH application "${String(application)}"; use one of ${NPSH_APPLICATIONS.join(', ')}.`);
  }
  const high = nss_us === undefined || nss_us >= NSS_THRESHOLD_US;
  const nssWords = nss_us === undefined ? 'Nss unknown, taken as 7500 or more' : `Nss ${Math.round(nss_us)} (US)`;
  const base = { application, nss_assumed_high: nss_us === undefined, ...(nss_us !== undefined ? { nss_us } : {}) };
  switch (application) {
    case 'general':
      return high
        ? { ...base, ratio: 1.2, min_margin_m: 1.0, basis: `ANSI/HI 9.6.1, general/water, ${nssWords}: ratio 1.2 or 1.0 m, whichever is more` }
        : { ...base, ratio: 1.1, min_margin_m: 0.6, basis: `ANSI/HI 9.6.1, general/water, ${nssWords}: ratio 1.1 or 0.6 m, whichever is more` };
    case 'hydrocarbon':
      return { ...base, ratio: 1.1, min_margin_m: 1.0, basis: `ANSI/HI 9.6.1, hydrocarbon within the AOR: ratio 1.1 or 1.0 m, whichever is more` };
    case 'building-services':
      return high
        ? { ...base, ratio: 1.1, min_margin_m: 0.6, basis: `ANSI/HI 9.6.1, building services, ${nssWords}: ratio 1.1 or 0.6 m, whichever is more` }
        : { ...base, ratio: 1.0, min_margin_m: 0, basis: `ANSI/HI 9.6.1, building services, ${nssWords}: NPSHa above NPSH3 throughout the AOR` };
  }
}

/**
 * Compares NPSHa with NPSH3 [m]:
 * - 'cavitation-expected' when NPSHa ≤ NPSH3 (the head is already falling by 3 % or more);
 * - 'below-guidance' when NPSHa is above NPSH3 but below max(ratio·NPSH3, NPSH3 + margin);
 * - 'meets-guidance' otherwise (for the ratio-1.0 line, NPSHa must be strictly above NPSH3).
 */
export function judgeNpshMargin(npsha_m: number, npsh3_m: number, rule: NpshMarginRule): NpshJudgement {
  if (!Number.isFinite(npsha_m) || !(npsh3_m > 0)) throw new DutyError('NPSH3 must be a positive number of metres and NPSHa a finite one.');
  const required = Math.max(rule.ratio * npsh3_m, npsh3_m + rule.min_margin_m);
  const ratio = npsha_m / npsh3_m;
  const margin = npsha_m - npsh3_m;
  const verdict: NpshVerdict = npsha_m <= npsh3_m ? 'cavitation-expected' : npsha_m >= required ? 'meets-guidance' : 'below-guidance';
  const message =
    verdict === 'cavitation-expected'
      ? `NPSHa is not above NPSH3 (ratio ${ratio.toFixed(2)}): the pump will cavitate with a head drop of 3 % or more.`
      : verdict === 'below-guidance'
        ? `NPSHa exceeds NPSH3 (ratio ${ratio.toFixed(2)}) but falls ${f((100 * (required - npsha_m)) / required)} % short of the NPSHa the guidance asks for (ratio ${(required / npsh3_m).toFixed(2)}).`
        : `NPSHa exceeds NPSH3 with ratio ${ratio.toFixed(2)}, meeting the guidance (ratio ${(required / npsh3_m).toFixed(2)} needed here).`;
  return { npsha_m, npsh3_m, ratio, margin_m: margin, required_npsha_m: required, verdict, rule, message };
}

function f(v: number): string {
  return v.toFixed(1);
}
