/** Building findings with stable identifiers. */
import type { Finding, Member, Quantity, Severity } from '../../model/curveset.ts';

export interface FindingSpec {
  code: string;
  severity: Severity;
  member?: Pick<Member, 'diameter_m' | 'speed_rpm'>;
  quantity?: Quantity;
  trace?: string;
  message: string;
  method: string;
  figures?: Record<string, number>;
}

/**
 * The id is the check code plus its subject, so the same problem on the same curve keeps
 * its id from one run to the next (and can be linked to its trace on screen).
 */
export function makeFinding(spec: FindingSpec): Finding {
  const subject: Finding['subject'] = {};
  const parts = [spec.code];
  if (spec.member?.diameter_m !== undefined) {
    subject.diameter_m = spec.member.diameter_m;
    parts.push(`d=${Number((spec.member.diameter_m * 1000).toPrecision(6))}mm`);
  } else if (spec.member?.speed_rpm !== undefined) {
    subject.speed_rpm = spec.member.speed_rpm;
    parts.push(`n=${Number(spec.member.speed_rpm.toPrecision(6))}rpm`);
  }
  if (spec.quantity) {
    subject.quantity = spec.quantity;
    parts.push(spec.quantity);
  }
  if (spec.trace) {
    subject.trace = spec.trace;
    parts.push(`trace=${spec.trace}`);
  }
  const figures: Record<string, number> = {};
  for (const [k, v] of Object.entries(spec.figures ?? {})) if (Number.isFinite(v)) figures[k] = v;
  return { id: parts.join('/'), code: spec.code, severity: spec.severity, subject, message: withoutPlaceholders(spec.message), method: spec.method, figures };
}

const ORDER: Record<Severity, number> = { fail: 0, warn: 1, note: 2 };

/** Most severe first, then by id, so reports read the same every time. */
export function sortFindings(findings: Finding[]): Finding[] {
  return [...findings].sort((a, b) => ORDER[a.severity] - ORDER[b.severity] || a.id.localeCompare(b.id));
}

export function worstSeverity(findings: readonly Finding[]): Severity | undefined {
  if (findings.some((f) => f.severity === 'fail')) return 'fail';
  if (findings.some((f) => f.severity === 'warn')) return 'warn';
  return findings.length ? 'note' : undefined;
}

/** A figure that is not a number, as the formatters print it: NaN, ±Infinity, or the "—" placeholder. */
const NOT_A_FIGURE = /[+−-]?(?:NaN|Infinity)|—/g;

/**
 * Last line of defence for clean output: a figure that could not be computed is never shown
 * as NaN, Infinity or "—". It is said in words, and the finding says why. Checks should
 * leave such clauses out themselves (affinityCheck does); this catches what they miss.
 */
export function withoutPlaceholders(message: string): string {
  if (!message.match(NOT_A_FIGURE)) return message;
  return `${message.replace(NOT_A_FIGURE, '(not computable)')} A figure marked "not computable" could not be evaluated from the fitted curves (they overflow or are undefined there); check the points and fits of this curve.`;
}
