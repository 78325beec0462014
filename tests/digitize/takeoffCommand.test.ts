import { describe, expect, it, beforeAll } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { evaluateUnchecked, linspace } from '../../src/fit/polynomial.ts';
import { CurveSet } from '../../src/model/curveset.ts';
import { parseTakeoff } from '../../src/model/takeoff.ts';
import { makePumpSheetPdf, pumpTakeoff } from './fixtures/pumpSheet.ts';

const root = join(import.meta.dirname, '..', '..');

function pumpscribe(...args: string[]) {
  const r = spawnSync(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'src', 'cli', 'main.ts'), ...args], { encoding: 'utf8' });
  return { code: r.status, stdout: r.stdout, stderr: r.stderr };
}

describe('pumpscribe takeoff', () => {
  let dir: string;
  beforeAll(async () => {
    dir = mkdtempSync(join(tmpdir(), 'pumpscribe-cli-'));
    writeFileSync(join(dir, 'sheet.pdf'), await makePumpSheetPdf());
    writeFileSync(join(dir, 'pump.takeoff.json'), JSON.stringify(pumpTakeoff('iso'), null, 2));
  });

  it('writes a checked curve set and exits 0, and --save-points writes the captured points back for replay', () => {
    const file = join(dir, 'pump.takeoff.json');
    const out = join(dir, 'pump.curveset.json');
    const run = pumpscribe('takeoff', file, '-o', out, '--save-points');
    expect(run.stderr).toBe('');
    expect(run.code).toBe(0);
    const set = CurveSet.parse(JSON.parse(readFileSync(out, 'utf8')));
    expect(set.members).toHaveLength(3);
    const saved = parseTakeoff(JSON.parse(readFileSync(file, 'utf8')));
    expect(saved.sheet_sha256).toBe(set.provenance.source?.sha256);
    expect(saved.traces.every((t) => (t.captured?.length ?? 0) >= 2 && t.captured_by === 'vector')).toBe(true);

    // Replaying from the saved points gives the same curves, to the 1e-4 sheet-unit rounding of
    // the saved points (about 3e-7 of a 300-pt panel; 1e-6 of the curve's largest value allowed).
    // The curves are compared, not their coefficients: a degree-6 power fit of exact drawn points
    // moves its coefficients by 4e-4 for the same rounding while the curve moves by 1.5e-7.
    const again = join(dir, 'again.curveset.json');
    expect(pumpscribe('takeoff', file, '-o', again, '--use-captured', '-q').code).toBe(0);
    const set2 = CurveSet.parse(JSON.parse(readFileSync(again, 'utf8')));
    set.members.forEach((m, k) => {
      for (const q of ['head', 'power', 'efficiency'] as const) {
        const a = m.curves[q]!.fit!;
        const b = set2.members[k]!.curves[q]!.fit!;
        expect(b.degree).toBe(a.degree);
        const flows = linspace(a.domain[0], a.domain[1], 51);
        const largest = Math.max(...flows.map((x) => Math.abs(evaluateUnchecked(a, x))));
        for (const x of flows) expect(Math.abs(evaluateUnchecked(a, x) - evaluateUnchecked(b, x))).toBeLessThan(1e-6 * largest);
      }
    });
  });

  it('exits 1 when a check fails (power inconsistent with head and efficiency)', () => {
    const doc = pumpTakeoff('iso') as { pump: Record<string, unknown> };
    doc.pump.specific_gravity = 1.6; // the sheet's power was drawn for water
    const file = join(dir, 'heavy.takeoff.json');
    writeFileSync(file, JSON.stringify(doc));
    const run = pumpscribe('takeoff', file, '-o', join(dir, 'heavy.curveset.json'), '-q');
    expect(run.code).toBe(1);
  });

  it('leaves out a panel whose anchors define no calibration with a fail (exit 1), and writes what the other panels give', () => {
    const doc = pumpTakeoff('iso') as { panels: { id: string; anchors: unknown[] }[] };
    (doc.panels.find((p) => p.id === 'power') as { anchors: unknown[] }).anchors = [{ at: [80, 360], x: 0, y: 0 }, { at: [80, 360], x: 1600, y: 0 }, { at: [80, 60], x: 0, y: 200 }];
    const file = join(dir, 'one-bad-panel.takeoff.json');
    writeFileSync(file, JSON.stringify(doc));
    const out = join(dir, 'one-bad-panel.curveset.json');
    const run = pumpscribe('takeoff', file, '-o', out, '--json');
    expect(run.code).toBe(1);
    const set = JSON.parse(readFileSync(out, 'utf8')) as { findings: { code: string; severity: string; message: string }[]; members: { curves: Record<string, unknown> }[] };
    const left = set.findings.filter((f) => f.code === 'takeoff.panel-uncalibrated');
    expect(left.map((f) => f.severity)).toEqual(['fail']);
    expect(left[0]?.message).toMatch(/^Panel "power": anchors 1 and 2 sit on the same sheet point/);
    expect(set.members.every((m) => m.curves.head !== undefined && m.curves.power === undefined)).toBe(true);
  });

  const bad: [string, (d: Record<string, unknown>) => void, RegExp][] = [
    ['a take-off without panels', (d) => delete d.panels, /^pumpscribe: The take-off file ".*" is not valid — panels:/],
    ['a missing sheet', (d) => (d.sheet = 'nowhere.pdf'), /^pumpscribe: The sheet file ".*nowhere.pdf" does not exist/],
    ['a damaged sheet', (d) => (d.sheet = 'damaged.pdf'), /^pumpscribe: The PDF "damaged.pdf" is damaged/],
    ['an unknown unit', (d) => ((d.units as Record<string, string>).flow = 'furlongs'), /^pumpscribe: Unknown flow unit "furlongs"/],
    ['degenerate anchors on every panel', (d) => (d.panels as { anchors: unknown[] }[]).forEach((p) => (p.anchors = [{ at: [80, 360], x: 0, y: 0 }, { at: [80, 360], x: 1600, y: 0 }, { at: [80, 60], x: 0, y: 200 }])), /^pumpscribe: Panel "head": anchors 1 and 2 sit on the same sheet point/],
    ['guides on no drawn line', (d) => ((d.traces as { guides: number[][]; method?: string }[])[0]!.guides = [[300, 700], [310, 710]]) && (((d.traces as { method?: string }[])[0]!.method = 'vector'), true), /^pumpscribe: Trace H13 \(head at diameter 13 in on panel "head"\): No drawn line passes/],
  ];
  for (const [name, spoil, message] of bad) {
    it(`gives one sentence and exit 2 for ${name}`, () => {
      writeFileSync(join(dir, 'damaged.pdf'), Buffer.concat([Buffer.from('%PDF-1.7\n'), Buffer.alloc(500, 0x41)]));
      const doc = pumpTakeoff('iso');
      spoil(doc);
      const file = join(dir, `bad-${name.replace(/\W+/g, '-')}.takeoff.json`);
      writeFileSync(file, JSON.stringify(doc));
      const out = join(dir, `never-${name.replace(/\W+/g, '-')}.curveset.json`);
      const run = pumpscribe('takeoff', file, '-o', out);
      expect(run.code).toBe(2);
      expect(run.stderr).toMatch(message);
      expect(run.stderr.trim().split('\n')).toHaveLength(1);
      expect(existsSync(out)).toBe(false);
    });
  }

  it('gives one sentence and exit 2 for a file that is not JSON', () => {
    const file = join(dir, 'broken.takeoff.json');
    writeFileSync(file, '{ "sheet": ');
    const run = pumpscribe('takeoff', file, '-o', join(dir, 'x.json'));
    expect(run.code).toBe(2);
    expect(run.stderr).toMatch(/^pumpscribe: The take-off file ".*" is not valid JSON/);
  });
});
