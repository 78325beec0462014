import { bedReplay } from '../randomSheets/bedReplay.ts';
const seed = Number(process.argv[2]);
const { replay, plan } = await bedReplay(seed);
for (const t of replay.traces) {
  const xs = t.points.map((p) => p[0]);
  const line = plan.lines.find((l) => l.id === t.id);
  console.log(t.id, t.points.length, Math.min(...xs).toFixed(0), Math.max(...xs).toFixed(0), line ? `drawn ${Math.min(...line.points.map((p) => p[0])).toFixed(0)}-${Math.max(...line.points.map((p) => p[0])).toFixed(0)} (flat)` : '');
}
for (const f of replay.curveSet.findings) if (f.severity !== 'note') console.log(f.code, f.subject.trace ?? '', f.message.slice(0, 120));
