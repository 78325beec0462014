/**
 * The error profile of one curve found on a bed scan (no panels, no traces, the plan's diameters
 * given): at 11 flows over its scored range, the fitted curve, the nearest traced point and the
 * exact value, % of span. A tool for reading why a confident curve is off, not a score.
 *
 *   npx tsx scripts/detectSheets/curveProfile.ts 52 power-340
 */
import { closeTextReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { evaluateUnchecked } from '../../src/fit/polynomial.ts';
import { exact, siFactor } from '../randomSheets/pumpFamily.ts';
import { truthOf } from '../randomSheets/randomSheet.ts';
import { detectBedScan } from './scanBed.ts';

const seed = Number(process.argv[2] ?? 52);
const id = process.argv[3] ?? 'power-340';
const { plan, sheet, found } = await detectBedScan(seed);
const replay = await replayTakeoff(found.takeoff, sheet, { created: '2026-01-01T00:00:00.000Z' });
if ('refused' in replay.curveSet) throw new Error('refused');
const truth = truthOf(plan).find((t) => `${t.quantity}-${t.diameter}` === id);
if (!truth) throw new Error(`no ${id}`);
const si = siFactor(plan.family);
const member = replay.curveSet.members.find((m) => m.diameter_m !== undefined && Math.abs(m.diameter_m - truth.diameter * si.diameter) < 1e-9);
const curve = member?.curves[truth.quantity];
const toValue = truth.quantity === 'efficiency' ? 0.01 : truth.quantity === 'power' ? si.power : si.head;
process.stdout.write(`${id}: fit degree ${curve?.fit?.coefficients?.length ?? '-'} points ${curve?.points?.length ?? '-'}\n`);
for (let i = 0; i <= 10; i++) {
  const q = truth.range[0] + ((truth.range[1] - truth.range[0]) * i) / 10;
  const want = exact(plan.family, truth.quantity, truth.diameter, q);
  const fit = curve?.fit ? evaluateUnchecked(curve.fit, q * si.flow) / toValue : NaN;
  const near = (curve?.points ?? []).reduce((a: { d: number; v: number } | null, p) => {
    const d = Math.abs(p[0] / si.flow - q);
    return !a || d < a.d ? { d, v: p[1] / toValue } : a;
  }, null);
  process.stdout.write(`  q ${q.toPrecision(4)}: fit ${(100 * (fit - want) / truth.span).toFixed(3)} % point ${near ? (100 * (near.v - want) / truth.span).toFixed(3) : '-'} % (at ${near?.d.toPrecision(3)})\n`);
}
for (const f of replay.curveSet.findings.filter((f) => f.severity !== 'note')) process.stdout.write(`  finding ${f.severity} ${f.code} ${JSON.stringify(f.subject)}\n`);
await sheet.close();
await closeTextReaderNode();
