/**
 * Writes the invented demo samples: a points table per family and the curve set built from
 * it with the same code `pumpscribe build` runs. Run: npx tsx scripts/make-demo.ts
 * Every number is invented; nothing here describes a real product.
 */
import { writeFileSync, mkdirSync } from 'node:fs';
import { spawnSync } from 'node:child_process';
import { inventedSiFamily, inventedUsFamily } from '../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints } from '../src/demo/sampling.ts';

mkdirSync('samples/demo', { recursive: true });
const demos = [
  { stem: 'invented-es4-us', fam: inventedUsFamily(), system: 'us' as const, seed: 2026 },
  { stem: 'invented-si3-si', fam: inventedSiFamily(), system: 'si' as const, seed: 2027 },
];
for (const d of demos) {
  const csv = `samples/demo/${d.stem}.points.csv`;
  const comment = `${d.fam.name}. INVENTED demo data, not a real product.\nRead from exact invented curves with about 0.3 % reading noise; ${d.fam.speed_rpm} rpm, ${d.system.toUpperCase()} units, efficiency in %.`;
  writeFileSync(csv, pointsTableText(samplePoints(d.fam, { system: d.system, seed: d.seed }), comment));
  const out = `samples/demo/${d.stem}.curveset.json`;
  const r = spawnSync(process.execPath, ['node_modules/tsx/dist/cli.mjs', 'src/cli/main.ts', 'build', csv, '-o', out, '--units', d.system, '--speed', String(d.fam.speed_rpm), '--name', d.fam.name, '--maker', 'Invented demo maker (not a real company)', '-q'], { stdio: 'inherit' });
  if (r.status !== 0) process.exit(r.status ?? 2);
  console.log(`Wrote ${csv} and ${out}`);
}
