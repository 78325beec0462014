/**
 * A fragment of an EPANET input file (INP) for a network model: `[CURVES]` with one head
 * curve (and, where fitted, one efficiency curve) per impeller diameter or for one chosen
 * trim, plus `[PUMPS]` and `[ENERGY]` lines to paste.
 *
 * How EPANET reads a pump curve (EPANET 2 Users Manual, section 3.4 "Curves", published):
 *  - flows and heads in the model's flow units (FLOW UNITS option) and the matching head unit:
 *    ft with CFS, GPM, MGD, IMGD, AFD; m with LPS, LPM, MLD, CMH, CMD;
 *  - a single point or three points are turned into a formula (H = A − B·Q^C); any other
 *    number of points is used as a table with straight lines between them, so we always write
 *    at least four points;
 *  - head must fall as flow rises: a curve whose head first rises from shutoff (a drooping
 *    curve) is refused as an invalid pump curve. Such a curve is written from its peak, with a
 *    comment and a finding.
 * The efficiency curve is flow against efficiency in %.
 *
 * Every curve is sampled on an even flow grid inside the fitted range: nothing is extrapolated.
 * Pure: builds text, no file access.
 */
import type { CurveSet, Finding, Member, PolynomialFit } from '../model/curveset.ts';
import { argMax, evaluateUnchecked, linspace } from '../fit/polynomial.ts';
import { makeFinding } from '../fit/checks/finding.ts';
import { memberAtDiameter, membersByDiameter } from '../fit/affinity.ts';
import { fromSI, parseUnit, type Unit } from '../units/index.ts';
import { ExportInputError } from './csvTable.ts';
import { cell, exportUnits } from './unitView.ts';

/** EPANET's flow-unit words and the unit token each maps to in src/units, with its head unit. */
export const INP_FLOW_UNITS = {
  GPM: { flow: 'gpm', head: 'ft' },
  CFS: { flow: 'ft3/s', head: 'ft' },
  MGD: { flow: 'MGD', head: 'ft' },
  IMGD: { flow: 'IMGD', head: 'ft' },
  AFD: { flow: 'acre-ft/d', head: 'ft' },
  LPS: { flow: 'L/s', head: 'm' },
  LPM: { flow: 'L/min', head: 'm' },
  MLD: { flow: 'ML/d', head: 'm' },
  CMH: { flow: 'm3/h', head: 'm' },
  CMD: { flow: 'm3/d', head: 'm' },
} as const;
export type InpFlowUnits = keyof typeof INP_FLOW_UNITS;

export interface EpanetOptions {
  /** The INP's flow units (default: from the set's own flow unit, else GPM for US sets and LPS for SI). */
  flowUnits?: string;
  /** One trim to export instead of every diameter, in metres. */
  diameter_m?: number;
  /** Points per curve (4 … 200, default 21). */
  points?: number;
  /** Node IDs for the [PUMPS] line (defaults SUCTION and DISCHARGE, to be replaced). */
  fromNode?: string;
  toNode?: string;
}

export interface EpanetExport {
  text: string;
  findings: Finding[];
  flowUnits: InpFlowUnits;
  /** Curve IDs written, head curve first, per member. */
  curves: Array<{ member: string; head: string; efficiency?: string; pump: string; from_m3s: number; to_m3s: number }>;
}

const METHOD = 'EPANET pump curve rules (EPANET 2 Users Manual, section 3.4)';
/** Largest ID EPANET accepts is 31 characters (EPANET 2 Users Manual, appendix C). */
const MAX_ID = 31;
/** A rise of head above shutoff smaller than this share of shutoff head is taken as flat (common practice: reading accuracy of a sheet). */
const DROOP_TOLERANCE = 1e-4;

function defaultFlowUnits(set: CurveSet): InpFlowUnits {
  // The set's own units, canonical ("usgpm" is gpm, "feet" is ft), from the one unit table.
  const own = exportUnits(set);
  for (const [word, spec] of Object.entries(INP_FLOW_UNITS)) if (spec.flow.toLowerCase() === own.flow.token.toLowerCase()) return word as InpFlowUnits;
  return own.head.token === 'ft' ? 'GPM' : 'LPS';
}

function inpUnits(word: string): { word: InpFlowUnits; flow: Unit; head: Unit } {
  const upper = word.toUpperCase() as InpFlowUnits;
  const spec = INP_FLOW_UNITS[upper];
  if (!spec) throw new ExportInputError(`Unknown EPANET flow units "${word}"; use one of ${Object.keys(INP_FLOW_UNITS).join(', ')}.`);
  let flow: Unit;
  try {
    flow = parseUnit('flow', spec.flow);
  } catch {
    throw new ExportInputError(`EPANET flow units ${upper} (${spec.flow}) are not in Pumpscribe's unit table yet; use GPM, LPS, LPM or CMH.`);
  }
  return { word: upper, flow, head: parseUnit('head', spec.head) };
}

/** Letters, digits, '-', '_' and '.' only, so the ID survives any INP reader. */
function idPart(text: string): string {
  return text.replace(/[^A-Za-z0-9._-]+/g, '_').replace(/^_+|_+$/g, '');
}

function memberLabel(m: Member, set: CurveSet): string {
  if (m.diameter_m === undefined) return `${cell(m.speed_rpm)}rpm`;
  const d = exportUnits(set).diameter;
  return `${cell(fromSI(m.diameter_m, d))}${d.token}`;
}

/** Where an EPANET head curve can start: shutoff, or the peak of a drooping curve. */
export function headCurveStart(fit: PolynomialFit): { from: number; drooping: boolean; rise: number } {
  const [lo, hi] = fit.domain;
  const peak = argMax(fit, lo, hi);
  const h0 = evaluateUnchecked(fit, lo);
  const rise = evaluateUnchecked(fit, peak) - h0;
  const drooping = peak > lo && rise > DROOP_TOLERANCE * Math.abs(h0);
  return { from: drooping ? peak : lo, drooping, rise };
}

export function curveSetToEpanet(set: CurveSet, options: EpanetOptions = {}): EpanetExport {
  const n = options.points ?? 21;
  if (!Number.isInteger(n) || n < 4 || n > 200) {
    throw new ExportInputError(`The number of points per EPANET curve must be a whole number from 4 to 200, not ${options.points} (EPANET reads 1 or 3 points as a formula, not as the curve).`);
  }
  const units = inpUnits(options.flowUnits ?? defaultFlowUnits(set));
  const fromNode = idPart(options.fromNode ?? 'SUCTION') || 'SUCTION';
  const toNode = idPart(options.toNode ?? 'DISCHARGE') || 'DISCHARGE';
  const base = idPart(set.pump.model ?? set.pump.name).slice(0, 12) || 'PUMP';

  let members: Array<Member & { extrapolated?: boolean }>;
  if (options.diameter_m !== undefined) {
    if (set.family !== 'diameter') throw new ExportInputError('This curve set is a speed family; a trim diameter applies only to a family of impeller diameters.');
    const trim = memberAtDiameter(set, options.diameter_m);
    if (trim.extrapolated) {
      throw new ExportInputError(`The trim ${cell(fromSI(options.diameter_m, exportUnits(set).diameter))} ${exportUnits(set).diameter.token} lies outside the captured diameters; choose a trim between the smallest and the largest impeller.`);
    }
    members = [trim];
  } else {
    members = set.family === 'diameter' ? membersByDiameter(set) : [...set.members].sort((a, b) => b.speed_rpm - a.speed_rpm);
  }

  const findings: Finding[] = [];
  const curveLines: string[] = [];
  const pumpLines: string[] = [];
  const energyLines: string[] = [];
  const written: EpanetExport['curves'] = [];
  const fmt = (v: number) => cell(v);

  members.forEach((m, index) => {
    const label = memberLabel(m, set);
    const headFit = m.curves.head?.fit;
    if (!headFit) {
      findings.push(makeFinding({ code: 'export.epanet-no-head', severity: 'warn', member: m, quantity: 'head', message: `The ${label} member has no fitted head curve, so no EPANET curve was written for it.`, method: METHOD }));
      return;
    }
    const start = headCurveStart(headFit);
    const flows = linspace(start.from, headFit.domain[1], n);
    const heads = flows.map((q) => evaluateUnchecked(headFit, q));
    // EPANET needs head to fall strictly; stop the table where a fit flattens out or turns up again.
    let last = heads.length - 1;
    for (let i = 1; i < heads.length; i++) {
      if (!((heads[i] as number) < (heads[i - 1] as number))) {
        last = i - 1;
        break;
      }
    }
    if (last < 3) {
      findings.push(makeFinding({ code: 'export.epanet-not-falling', severity: 'fail', member: m, quantity: 'head', message: `The ${label} head curve does not fall with flow over enough of its range for an EPANET pump curve; check the head trace.`, method: METHOD }));
      return;
    }
    const used = flows.slice(0, last + 1);
    const headId = `${base}_H_${idPart(label)}`.slice(0, MAX_ID);
    const effId = `${base}_E_${idPart(label)}`.slice(0, MAX_ID);
    const pumpId = `${base}_P_${idPart(label)}`.slice(0, MAX_ID);

    curveLines.push(`;PUMP: ${set.pump.name}, ${label}, ${cell(m.speed_rpm)} rpm — head [${units.head.token}] against flow [${units.flow.token}]`);
    if (start.drooping) {
      const message =
        `The ${label} head curve rises from shutoff to a peak at ${cell(fromSI(start.from, units.flow))} ${units.flow.token} ` +
        `(${cell(fromSI(start.rise, units.head))} ${units.head.token} above shutoff); EPANET refuses a rising pump curve, so it is written from the peak. Do not run the pump below that flow in the model.`;
      curveLines.push(`; drooping curve: written from its peak at ${cell(fromSI(start.from, units.flow))} ${units.flow.token}; flows below it are not in the table`);
      findings.push(makeFinding({ code: 'export.epanet-drooping', severity: 'warn', member: m, quantity: 'head', message, method: METHOD, figures: { peak_flow_m3s: start.from, rise_m: start.rise } }));
    }
    if (last < heads.length - 1) {
      const stop = used[used.length - 1] as number;
      curveLines.push(`; the fitted head stops falling at ${cell(fromSI(stop, units.flow))} ${units.flow.token}; the table ends there`);
      findings.push(makeFinding({ code: 'export.epanet-cut', severity: 'warn', member: m, quantity: 'head', message: `The ${label} head curve stops falling at ${cell(fromSI(stop, units.flow))} ${units.flow.token}, before the end of its fitted range; the EPANET table ends there.`, method: METHOD }));
    }
    for (let i = 0; i <= last; i++) curveLines.push(`${headId}\t${fmt(fromSI(used[i] as number, units.flow))}\t${fmt(fromSI(heads[i] as number, units.head))}`);

    const effFit = m.curves.efficiency?.fit;
    let effWritten: string | undefined;
    if (effFit) {
      const lo = Math.max(effFit.domain[0], 0);
      const effFlows = linspace(lo, effFit.domain[1], n);
      curveLines.push(`;EFFICIENCY: ${set.pump.name}, ${label} — efficiency [%] against flow [${units.flow.token}]`);
      for (const q of effFlows) curveLines.push(`${effId}\t${fmt(fromSI(q, units.flow))}\t${fmt(100 * Math.max(0, evaluateUnchecked(effFit, q)))}`);
      effWritten = effId;
    }
    curveLines.push('');

    const comment = index === 0 ? '' : ';';
    pumpLines.push(`${comment}${pumpId}\t${fromNode}\t${toNode}\tHEAD ${headId}\t; ${label}`);
    if (effWritten) energyLines.push(`${comment}PUMP\t${pumpId}\tEFFIC\t${effWritten}`);
    written.push({ member: label, head: headId, ...(effWritten ? { efficiency: effWritten } : {}), pump: pumpId, from_m3s: used[0] as number, to_m3s: used[used.length - 1] as number });
  });

  if (written.length === 0) throw new ExportInputError('No member of this curve set has a head curve EPANET can use; check the head traces.');

  const source = set.provenance.source?.file ?? set.provenance.points_file ?? set.provenance.takeoff;
  const text = [
    `; EPANET fragment written by ${set.provenance.tool.name} — ${set.pump.name}, ${cell(set.speed_rpm)} rpm, ${set.fluid.name} (${cell(set.fluid.density_kg_m3)} kg/m³)`,
    ...(source ? [`; source: ${source}`] : []),
    `; Flow units ${units.word} (flow ${units.flow.token}, head ${units.head.token}): the model's [OPTIONS] must say "Units ${units.word}".`,
    `; Curves are sampled evenly inside each fitted range (${n} points), never extrapolated. Paste [CURVES] into the model,`,
    `; then one [PUMPS] line (replace ${fromNode} and ${toNode} by the model's nodes) and its [ENERGY] line.`,
    '; Preliminary engineering: verify against certified data and local codes; have a licensed professional approve the selection.',
    '',
    '[CURVES]',
    ...curveLines,
    '[PUMPS]',
    ...(pumpLines.length > 1 ? ['; one line per impeller: the first is active; to model another, comment it out and uncomment that one (and its [ENERGY] line)'] : []),
    ';ID\tNode1\tNode2\tParameters',
    ...pumpLines,
    '',
    ...(energyLines.length ? ['[ENERGY]', ...energyLines, ''] : []),
  ].join('\n');
  return { text, findings, flowUnits: units.word, curves: written };
}
