/**
 * `pumpscribe takeoff --detect` on a committed INVENTED vector sample: from a take-off file
 * holding only sheet, page, speed and units to a checked curve set, with the completed
 * take-off written back by --save-points (found parts marked "detected"), and clear refusals.
 */
import { spawnSync } from 'node:child_process';
import { copyFileSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { CurveSet } from '../../src/model/curveset.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';

const root = join(import.meta.dirname, '..', '..');
const samples = join(root, 'samples', 'sheets');

function pumpscribe(...args: string[]) {
  const r = spawnSync(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'src', 'cli', 'main.ts'), ...args], { encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

const minimal = (sheet: string) => ({ sheet, page: 1, pump: { name: 'Invented pump (not a real product)', speed_rpm: 1780 }, units: { flow: 'gpm', head: 'ft', power: 'hp', npsh: 'ft', diameter: 'in' } });

describe('pumpscribe takeoff --detect', () => {
  let dir: string;
  beforeAll(() => {
    dir = mkdtempSync(join(tmpdir(), 'pumpscribe-detect-'));
    copyFileSync(join(samples, 'us-iso-colour.pdf'), join(dir, 'sheet.pdf'));
    copyFileSync(join(samples, 'us-iso-black-scan.jpg'), join(dir, 'scan.jpg'));
  });

  it('finds panels and traces from sheet, page, speed and units, and --save-points writes the completed take-off back', { timeout: 180_000 }, () => {
    const file = join(dir, 'pump.takeoff.json');
    writeFileSync(file, JSON.stringify(minimal('sheet.pdf'), null, 2));
    const out = join(dir, 'pump.curveset.json');
    const run = pumpscribe('takeoff', file, '--detect', '-o', out, '--save-points', '-q');
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const set = CurveSet.parse(JSON.parse(readFileSync(out, 'utf8')));
    expect(set.members.map((m) => Math.round((m.diameter_m as number) / 0.0254))).toEqual([13, 12, 11, 10]);

    const saved = parseTakeoff(JSON.parse(readFileSync(file, 'utf8')));
    expect(saved.panels.map((p) => [p.id, p.quantity, p.origin])).toEqual([
      ['head', 'head', 'detected'],
      ['power', 'power', 'detected'],
      ['npshr', 'npshr', 'detected'],
    ]);
    expect(saved.traces).toHaveLength(16);
    expect(saved.traces.every((t) => t.origin === 'detected' && (t.captured?.length ?? 0) >= 2)).toBe(true);
    expect(saved.detected?.questions).toEqual([]);
    expect(saved.detected?.by).toMatch(/detect/);

    // The completed take-off replays as an ordinary one, to the same curves.
    const again = join(dir, 'again.curveset.json');
    expect(pumpscribe('takeoff', file, '-o', again, '-q').code).toBe(0);
    const set2 = CurveSet.parse(JSON.parse(readFileSync(again, 'utf8')));
    expect(set2.members.map((m) => m.curves.head?.fit?.coefficients)).toEqual(set.members.map((m) => m.curves.head?.fit?.coefficients));
  });

  it('a speed given that is not the speed the sheet prints is a question, exit 1, written into the take-off', { timeout: 180_000 }, () => {
    const file = join(dir, 'speed.takeoff.json');
    writeFileSync(file, JSON.stringify({ ...minimal('sheet.pdf'), pump: { name: 'Invented pump (not a real product)', speed_rpm: 1750 } }, null, 2));
    const run = pumpscribe('takeoff', file, '--detect', '-o', join(dir, 'speed.curveset.json'), '--save-points', '-q');
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/^Question: The sheet prints 1780 rpm \(".*1780 rpm.*"\), but the speed given is 1750 rpm; check the pump's speed/m);
    // How to answer on the command line is said once, after the questions (they are the workbench's too).
    expect(run.stderr.match(/^To answer: .*--detect again\.$/gm)).toHaveLength(1);
    expect(parseTakeoff(JSON.parse(readFileSync(file, 'utf8'))).detected?.questions.some((q) => /The sheet prints 1780 rpm/.test(q))).toBe(true);
  });

  it('on the committed scan, whose axis titles stand over the frames, names the panels and the head curves, and exits 1 while its questions are open', { timeout: 60_000 }, () => {
    const file = join(dir, 'scan.takeoff.json');
    writeFileSync(file, JSON.stringify(minimal('scan.jpg')));
    const out = join(dir, 'scan.curveset.json');
    const run = pumpscribe('takeoff', file, '--detect', '-o', out);
    expect(run.code).toBe(1);
    expect(run.stderr).toMatch(/^Question: /m);
    expect(run.stderr).not.toMatch(/\n\s+at /);
    const set = CurveSet.parse(JSON.parse(readFileSync(out, 'utf8')));
    // The INVENTED sample draws 13, 12, 11 and 10 in impellers (its truth file).
    expect(set.members.map((m) => Math.round(((m.diameter_m as number) / 0.0254) * 1000) / 1000)).toEqual([13, 12, 11, 10]);
    expect(set.members.every((m) => m.curves.head !== undefined)).toBe(true);
  });

  it('without --detect a take-off without panels is refused as before', () => {
    const file = join(dir, 'bare.takeoff.json');
    writeFileSync(file, JSON.stringify(minimal('sheet.pdf')));
    const run = pumpscribe('takeoff', file, '-o', join(dir, 'bare.curveset.json'));
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/panels/);
  });
});
