/**
 * The committed INVENTED sample sheets (samples/sheets): they are what the generator writes,
 * they replay through the whole take-off into curves within the acceptance of their truth,
 * and the checks pass the consistent ones and name the fault of the faulty ones.
 */
import { createHash } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { loadSheetFileNode } from '../../src/digitize/loaders/sheetNode.ts';
import { replayTakeoff } from '../../src/digitize/takeoff.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { makeSheet } from '../../scripts/sheets/makeSheet.ts';
import { scoreCurveSet } from '../../scripts/sheets/score.ts';
import type { Truth } from '../../scripts/sheets/truth.ts';
import { SAMPLE_VARIANTS } from '../../scripts/sheets/variants.ts';

const DIR = join(import.meta.dirname, '..', '..', 'samples', 'sheets');
const json = (name: string) => JSON.parse(readFileSync(join(DIR, name), 'utf8')) as unknown;
const sha = (bytes: Uint8Array) => createHash('sha256').update(bytes).digest('hex');

const replays = new Map<string, ReturnType<typeof replayOnce>>();
const replay = (name: string) => {
  // Each sample is replayed once and shared by the tests below.
  let p = replays.get(name);
  if (!p) replays.set(name, (p = replayOnce(name)));
  return p;
};

async function replayOnce(name: string) {
  const takeoff = parseTakeoff(json(`${name}.takeoff.json`));
  const sheet = await loadSheetFileNode(join(DIR, takeoff.sheet));
  try {
    return (await replayTakeoff(takeoff, sheet, { created: '2024-01-01T00:00:00Z' })).curveSet;
  } finally {
    await sheet.close();
  }
}

describe('committed sample sheets', () => {
  it.each(SAMPLE_VARIANTS.map((v) => [v.spec.name, v] as const))('%s is exactly what the generator writes', async (_name, variant) => {
    const made = await makeSheet(variant);
    expect(sha(made.sheetBytes)).toBe(sha(new Uint8Array(readFileSync(join(DIR, made.sheetFile)))));
    expect(json(`${variant.spec.name}.takeoff.json`)).toEqual(JSON.parse(JSON.stringify(made.takeoff)));
    expect(json(`${variant.spec.name}.truth.json`)).toEqual(JSON.parse(JSON.stringify(made.truth)));
  });

  it.each(SAMPLE_VARIANTS.map((v) => [v.spec.name] as const))('%s replays into curves within the acceptance of its truth', async (name) => {
    const set = await replay(name);
    const rows = scoreCurveSet(json(`${name}.truth.json`) as Truth, set);
    expect(rows.length).toBeGreaterThan(8);
    for (const row of rows) expect(row.worst, `${row.id}: ${row.worst.toFixed(3)} against ${row.limit}`).toBeLessThan(row.limit); // % of span, or points
  });

  it('consistent samples pass the checks', async () => {
    for (const name of ['us-iso-colour', 'si-panels-black', 'us-iso-black-scan', 'si-panels-colour-scan', 'us-iso-colour-scan-pdf']) {
      const set = await replay(name);
      expect(set.findings.filter((f) => f.severity === 'fail').map((f) => f.message), name).toEqual([]);
    }
  });

  it('the sheet whose 11 in curves are announced as 11.6 in fails with an affinity finding naming 11.6', async () => {
    const set = await replay('us-iso-colour-affinity-fault');
    const fails = set.findings.filter((f) => f.severity === 'fail');
    expect(fails.some((f) => f.code.startsWith('affinity') && f.message.includes('11.6 in'))).toBe(true);
  });

  it('the sheet whose 12 in power curve is drawn 9 % high fails with a power-consistency finding naming 12 in', async () => {
    const set = await replay('us-iso-colour-power-fault');
    const fails = set.findings.filter((f) => f.severity === 'fail');
    expect(fails.some((f) => f.code === 'power.consistency' && f.message.includes('12 in'))).toBe(true);
  });
});
