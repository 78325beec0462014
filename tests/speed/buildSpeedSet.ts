/** Builds a curve set from a speed-family points table (SI: flow m3/h, head m, power kW), as the build command does. */
import { buildCurveSet, type MemberInput } from '../../src/fit/build.ts';
import type { CurvePoint, CurveSet } from '../../src/model/curveset.ts';
import { readPointsTable } from '../../src/model/pointsTable.ts';
import { parseUnit, toSI } from '../../src/units/index.ts';

export function buildSpeedSetFromText(text: string): CurveSet {
  const table = readPointsTable(text);
  if (table.family !== 'speed') throw new Error('expected a speed family');
  const flow = parseUnit('flow', 'm3/h');
  const unit = { head: parseUnit('head', 'm'), npshr: parseUnit('head', 'm'), power: parseUnit('power', 'kW'), efficiency: parseUnit('efficiency', '%') };
  const members = new Map<number, MemberInput>();
  for (const r of table.rows) {
    const m = members.get(r.speed as number) ?? { speed_rpm: r.speed as number, points: {} };
    members.set(r.speed as number, m);
    (m.points[r.quantity] ??= []).push([toSI(r.flow, flow), toSI(r.value, unit[r.quantity])] as CurvePoint);
  }
  return buildCurveSet({
    pump: { name: 'Invented demo pump VS-4 (not a real product)' },
    speed_rpm: Math.max(...members.keys()),
    family: 'speed',
    fluid: { name: 'water', density_kg_m3: 999.014, specific_gravity: 1 },
    display_units: { flow: 'm3/h', head: 'm', npsh: 'm', power: 'kW', diameter: 'mm' },
    provenance: { created: '2026-01-01T00:00:00Z' },
    members: [...members.values()],
  });
}
