/**
 * Seeded fuzz test of the command line (issue 18): mutated points tables, curve sets,
 * take-off files and library transfer files, each run through the CLI in-process
 * (cliInProcess.ts) and a few as real child processes. Every run must end as
 *   - a refusal: exit 2 and exactly one sentence on stderr, or
 *   - a result: exit 0 or 1, and any file it writes is a valid curve set;
 * never exit 3, never over 30 s, never NaN or Infinity in any output, never the "—"
 * placeholder inside a finding.
 *
 * The seed is fixed, so a failure names a case that replays exactly: rerun with the same
 * seed and look at the `case` label in the assertion message.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { inventedSiFamily, inventedUsFamily } from '../../src/demo/inventedFamily.ts';
import { pointsTableText, samplePoints } from '../../src/demo/sampling.ts';
import { parseCurveSetJson } from '../../src/model/curvesetIO.ts';
import { runCli, type Run } from './cliInProcess.ts';

const SEED = 18;
const ROOT = join(import.meta.dirname, '..', '..');
const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-fuzz-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));
const write = (name: string, text: string) => {
  const p = join(dir, name);
  writeFileSync(p, text);
  return p;
};

/** The rules every run obeys; `label` names the case in a failure. */
function expectSound(r: Run, label: string, output?: string): void {
  // The user's own text, quoted back in a refusal ("not \"Infinity\""), is not a computed figure.
  const all = `${r.out}\n${r.err}`.replace(/"[^"\n]*"/g, '""');
  expect([0, 1, 2], `${label}: exit ${r.code}\n${r.err}`).toContain(r.code);
  expect(r.ms, `${label}: took ${Math.round(r.ms)} ms`).toBeLessThan(30_000);
  expect(all, `${label}: NaN or Infinity in the output`).not.toMatch(/NaN|Infinity/);
  for (const line of r.out.split('\n').filter((l) => /^\s+(FAIL|WARN|NOTE)\s/.test(l))) expect(line, `${label}: placeholder in a finding`).not.toContain('—');
  if (r.code === 2) {
    const lines = r.err.trim().split('\n');
    expect(lines, `${label}: a refusal is one sentence\n${r.err}`).toHaveLength(1);
    expect(lines[0], label).toMatch(/^pumpscribe: \S.*[.)"]$/);
    expect(lines[0], label).not.toMatch(/Unexpected internal error|please report/i);
  } else if (output) {
    // A result: the file written is a curve set that reads back, with clean findings.
    expect(existsSync(output), `${label}: exit ${r.code} but no ${output}`).toBe(true);
    const text = readFileSync(output, 'utf8');
    expect(text, `${label}: NaN in the written file`).not.toMatch(/NaN|Infinity/);
    const set = parseCurveSetJson(text, output);
    for (const f of set.findings) expect(f.message, `${label}: placeholder in ${f.id}`).not.toContain('—');
    rmSync(output);
  }
}

const counts = { tables: 0, sets: 0, takeoffs: 0, transfers: 0, studies: 0 };
/** Exit codes per kind of input, printed at the end: a fuzz that only ever refuses tests little. */
const exits: Record<keyof typeof counts, [number, number, number]> = { tables: [0, 0, 0], sets: [0, 0, 0], takeoffs: [0, 0, 0], transfers: [0, 0, 0], studies: [0, 0, 0] };
const tally = (kind: keyof typeof counts, r: Run) => {
  counts[kind]++;
  (exits[kind] as number[])[r.code] = ((exits[kind] as number[])[r.code] ?? 0) + 1;
};

// ---------------------------------------------------------------------------------------
// Mutations, as plans drawn by fast-check and applied deterministically.

const ODD_CELLS = ['', ' ', 'abc', 'NaN', 'Infinity', '-Infinity', '1e309', '-5', '0', '0x10', '1e-300', '1e300', '12.5.3', '"7"', '١٢', '5e', '--1', '+3', '.5', '1_000'];
const odd = fc.constantFrom(...ODD_CELLS);
const cell = fc.oneof(odd, fc.double({ noNaN: false }).map(String), fc.integer({ min: -1e6, max: 1e6 }).map(String));

type TablePlan =
  | { kind: 'swap'; row: number }
  | { kind: 'cell'; row: number; column: number; value: string }
  | { kind: 'diameter-typo'; row: number; digit: number; quantityOnly: boolean }
  | { kind: 'quantity'; row: number; value: string }
  | { kind: 'drop'; row: number; count: number }
  | { kind: 'duplicate'; row: number }
  | { kind: 'truncate'; at: number }
  | { kind: 'header'; value: string }
  | { kind: 'scale'; row: number; factor: number }
  | { kind: 'only'; quantity: string }
  | { kind: 'noise'; text: string; at: number };

const tablePlan: fc.Arbitrary<TablePlan> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('swap' as const), row: fc.nat() }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('cell' as const), row: fc.nat(), column: fc.integer({ min: 0, max: 4 }), value: cell }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('diameter-typo' as const), row: fc.nat(), digit: fc.integer({ min: 0, max: 9 }), quantityOnly: fc.boolean() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('quantity' as const), row: fc.nat(), value: fc.constantFrom('head', 'HEAD', 'eff', 'npsh', 'power', 'efficiency', 'npshr', '') }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('drop' as const), row: fc.nat(), count: fc.integer({ min: 1, max: 40 }) }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('duplicate' as const), row: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('truncate' as const), at: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('header' as const), value: fc.constantFrom('quantity,diameter,flow', 'Quantity,Diameter,Flow,Value', 'diameter,quantity,flow,value', '', 'quantity;diameter;flow;value') }) },
  { weight: 3, arbitrary: fc.record({ kind: fc.constant('scale' as const), row: fc.nat(), factor: fc.constantFrom(10, 0.1, 100, -1, 1000, 1e-6) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('only' as const), quantity: fc.constantFrom('head', 'efficiency', 'power', 'npshr') }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('noise' as const), text: fc.constantFrom('\uFEFF', '\r\n', '\n\n', '# comment\n', ',,,,\n', '\0', 'x'.repeat(3000)), at: fc.nat() }) },
);

function mutateTable(text: string, plans: TablePlan[]): string {
  let lines = text.trimEnd().split('\n');
  for (const p of plans) {
    const body = lines.length - 1;
    const pick = (n: number) => 1 + (body > 0 ? n % body : 0);
    const cells = (i: number) => (lines[i] ?? '').split(',');
    switch (p.kind) {
      case 'swap': {
        const i = pick(p.row);
        const c = cells(i);
        if (c.length === 4) lines[i] = [c[0], c[1], c[3], c[2]].join(',');
        break;
      }
      case 'cell': {
        const i = pick(p.row);
        const c = cells(i);
        c[p.column % Math.max(1, c.length)] = p.value;
        lines[i] = c.join(',');
        break;
      }
      case 'diameter-typo': {
        // A digit typed in front of the diameter, in one row or in every row of one curve.
        const i = pick(p.row);
        const [q, d] = cells(i);
        lines = lines.map((l, k) => {
          const c = l.split(',');
          if (k === 0 || c[1] !== d || (p.quantityOnly && c[0] !== q) || (!p.quantityOnly && k !== i)) return l;
          c[1] = `${p.digit}${c[1]}`;
          return c.join(',');
        });
        break;
      }
      case 'quantity': {
        const i = pick(p.row);
        const c = cells(i);
        c[0] = p.value;
        lines[i] = c.join(',');
        break;
      }
      case 'drop':
        lines.splice(pick(p.row), p.count);
        break;
      case 'duplicate':
        lines.splice(pick(p.row), 0, lines[pick(p.row)] ?? '');
        break;
      case 'truncate': {
        const all = lines.join('\n');
        lines = all.slice(0, p.at % (all.length + 1)).split('\n');
        break;
      }
      case 'header':
        lines[0] = p.value;
        break;
      case 'scale': {
        const i = pick(p.row);
        const c = cells(i);
        if (c.length === 4) c[3] = String(Number(c[3]) * p.factor);
        lines[i] = c.join(',');
        break;
      }
      case 'only':
        lines = [lines[0] ?? '', ...lines.slice(1).filter((l) => l.startsWith(`${p.quantity},`))];
        break;
      case 'noise': {
        const all = lines.join('\n');
        const at = p.at % (all.length + 1);
        lines = `${all.slice(0, at)}${p.text}${all.slice(at)}`.split('\n');
        break;
      }
    }
  }
  return `${lines.join('\n')}\n`;
}

type JsonPlan =
  | { kind: 'set'; path: number; value: unknown }
  | { kind: 'scale'; path: number; factor: number }
  | { kind: 'delete'; path: number }
  | { kind: 'truncate-array'; path: number; keep: number }
  | { kind: 'text'; at: number; cut: boolean };

const jsonValue = fc.oneof(
  fc.constantFrom(null, '', 'NaN', 'abc', -1, 0, 1e308, -1e308, 5e-324, 1e20, true, [], {}, [1, 2], '12 in', 'm3/h', 'gpm', 'furlong'),
  fc.double(),
  fc.integer(),
);
const jsonPlan: fc.Arbitrary<JsonPlan> = fc.oneof(
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('set' as const), path: fc.nat(), value: jsonValue }) },
  { weight: 4, arbitrary: fc.record({ kind: fc.constant('scale' as const), path: fc.nat(), factor: fc.constantFrom(0.5, 2, -1, 0, 1e6, 1e-6, 1.01) }) },
  { weight: 2, arbitrary: fc.record({ kind: fc.constant('delete' as const), path: fc.nat() }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('truncate-array' as const), path: fc.nat(), keep: fc.integer({ min: 0, max: 3 }) }) },
  { weight: 1, arbitrary: fc.record({ kind: fc.constant('text' as const), at: fc.nat(), cut: fc.boolean() }) },
);

/** Every [parent, key] in a JSON tree, depth first, so that a plan's number picks one. */
function slots(root: unknown): [Record<string | number, unknown>, string | number][] {
  const out: [Record<string | number, unknown>, string | number][] = [];
  const walk = (v: unknown) => {
    if (v === null || typeof v !== 'object') return;
    for (const [k, child] of Object.entries(v)) {
      out.push([v as Record<string, unknown>, Array.isArray(v) ? Number(k) : k]);
      walk(child);
    }
  };
  walk(root);
  return out;
}

function mutateJson(text: string, plans: JsonPlan[]): string {
  let doc = JSON.parse(text) as unknown;
  let raw: string | undefined;
  for (const p of plans) {
    if (p.kind === 'text') {
      const all = raw ?? JSON.stringify(doc, null, 1);
      const at = p.at % (all.length + 1);
      raw = p.cut ? all.slice(0, at) : `${all.slice(0, at)}}${all.slice(at)}`;
      continue;
    }
    const all = slots(doc);
    if (all.length === 0) continue;
    const [parent, key] = all[p.path % all.length] as [Record<string | number, unknown>, string | number];
    if (p.kind === 'set') parent[key] = structuredClone(p.value);
    else if (p.kind === 'scale') {
      // Scale the next number at or after the slot: coefficients, points, diameters, speeds.
      const numeric = all.slice(p.path % all.length).find(([o, k]) => typeof o[k] === 'number');
      if (numeric) numeric[0][numeric[1]] = (numeric[0][numeric[1]] as number) * p.factor;
    } else if (p.kind === 'delete') {
      if (Array.isArray(parent)) parent.splice(key as number, 1);
      else delete parent[key];
    } else if (Array.isArray(parent[key])) (parent[key] as unknown[]).length = Math.min((parent[key] as unknown[]).length, p.keep);
  }
  if (raw !== undefined) return raw;
  doc = JSON.parse(JSON.stringify(doc)); // what a file can hold (non-finite numbers become null)
  return `${JSON.stringify(doc, null, 2)}\n`;
}

// ---------------------------------------------------------------------------------------

const TABLES = [
  { text: pointsTableText(samplePoints(inventedUsFamily(), { system: 'us', seed: 11 })), args: ['--units', 'us', '--speed', '1780'] },
  { text: pointsTableText(samplePoints(inventedSiFamily(), { system: 'si', seed: 7 })), args: ['--units', 'si', '--speed', '2900'] },
];
const SETS = ['invented-es4-us.curveset.json', 'invented-si3-si.curveset.json'].map((f) => readFileSync(join(ROOT, 'samples', 'demo', f), 'utf8'));
const TAKEOFF = readFileSync(join(ROOT, 'samples', 'sheets', 'si-panels-black.takeoff.json'), 'utf8').replace('"si-panels-black.pdf"', JSON.stringify(join(ROOT, 'samples', 'sheets', 'si-panels-black.pdf')));
const SPEEDS = fc.constantFrom('1780', '2900', '0', '-1', 'abc', '1e9', '0x10', '1480', '3550', '1e-3', 'Infinity');
/** Mostly the table's own options; now and then a slip in one of them. */
const sometimes = <T,>(arb: fc.Arbitrary<T>) => fc.oneof({ weight: 6, arbitrary: fc.constant(undefined) }, { weight: 1, arbitrary: arb });
const optionsArb = fc.record({ speed: sometimes(SPEEDS), units: sometimes(fc.constantFrom('us', 'si', 'US', 'metric', '')), sg: sometimes(fc.constantFrom('1', '0.85', '0', '-1', 'abc', '1000', '1.2')) });

describe(`fuzz (seed ${SEED})`, () => {
  it('300 mutated points tables: build refuses with a sentence or builds a sound curve set', async () => {
    const cases = fc.sample(fc.tuple(fc.nat({ max: 1 }), fc.array(tablePlan, { minLength: 1, maxLength: 3 }), optionsArb), { seed: SEED, numRuns: 300 });
    for (const [k, [base, plans, o]] of cases.entries()) {
      const table = TABLES[base]!;
      const args = [...table.args];
      if (o.speed !== undefined) args[3] = o.speed;
      if (o.units !== undefined) args[1] = o.units;
      if (o.sg !== undefined) args.push('--sg', o.sg);
      const out = join(dir, `t${k}.curveset.json`);
      const r = await runCli(['build', write(`t${k}.csv`, mutateTable(table.text, plans)), '-o', out, ...args]);
      expectSound(r, `table case ${k} ${JSON.stringify(plans)} ${args.join(' ')}`, out);
      tally('tables', r);
    }
  });

  it('300 mutated curve sets: check, export and scale refuse with a sentence or give a sound result', async () => {
    const cases = fc.sample(fc.tuple(fc.nat({ max: 1 }), fc.array(jsonPlan, { minLength: 1, maxLength: 3 }), fc.constantFrom('check', 'check-json', 'export-csv', 'export-json', 'scale')), { seed: SEED + 1, numRuns: 300 });
    for (const [k, [base, plans, command]] of cases.entries()) {
      const file = write(`s${k}.curveset.json`, mutateJson(SETS[base]!, plans));
      const out = join(dir, `s${k}.out.json`);
      const args =
        command === 'check' ? ['check', file]
        : command === 'check-json' ? ['check', file, '--json']
        : command === 'export-csv' ? ['export', file, '--format', 'csv', '--points', '7']
        : command === 'export-json' ? ['export', file, '--format', 'json', '--units', 'si']
        : ['scale', file, '--speed', '1450', '-o', out];
      const r = await runCli(args);
      expectSound(r, `set case ${k} ${command} ${JSON.stringify(plans)}`, command === 'scale' ? out : undefined);
      if (command === 'check-json' && r.code !== 2) expect(() => JSON.parse(r.out), `set case ${k}: --json prints JSON`).not.toThrow();
      tally('sets', r);
    }
  });

  it('40 mutated take-off files: takeoff refuses with a sentence or builds a sound curve set', async () => {
    const cases = fc.sample(fc.array(jsonPlan, { minLength: 1, maxLength: 2 }), { seed: SEED + 2, numRuns: 40 });
    for (const [k, plans] of cases.entries()) {
      const out = join(dir, `k${k}.curveset.json`);
      const r = await runCli(['takeoff', write(`k${k}.takeoff.json`, mutateJson(TAKEOFF, plans)), '-o', out]);
      expectSound(r, `take-off case ${k} ${JSON.stringify(plans)}`, out);
      tally('takeoffs', r);
    }
  });

  describe('library transfer files', () => {
    let transfer = '';
    beforeAll(async () => {
      const lib = join(dir, 'source.sqlite');
      for (const f of ['invented-es4-us.curveset.json', 'invented-si3-si.curveset.json']) {
        expect((await runCli(['library', 'add', join(ROOT, 'samples', 'demo', f), '--library', lib])).code).toBe(0);
      }
      const exported = join(dir, 'transfer.jsonl');
      expect((await runCli(['library', 'export', '-o', exported, '--library', lib])).code).toBe(0);
      transfer = readFileSync(exported, 'utf8');
    });

    it('70 mutated transfer files: import refuses with a sentence or imports', async () => {
      const linePlan = fc.oneof(
        fc.record({ kind: fc.constant('json' as const), line: fc.nat(), plans: fc.array(jsonPlan, { minLength: 1, maxLength: 2 }) }),
        fc.record({ kind: fc.constant('raw' as const), line: fc.nat(), text: fc.constantFrom('', '{', 'null', '[]', '{"kind":"entry"}', 'x'.repeat(100), '\uFEFF{}') }),
        fc.record({ kind: fc.constant('drop' as const), line: fc.nat() }),
        fc.record({ kind: fc.constant('duplicate' as const), line: fc.nat() }),
      );
      const cases = fc.sample(fc.array(linePlan, { minLength: 1, maxLength: 2 }), { seed: SEED + 3, numRuns: 70 });
      for (const [k, plans] of cases.entries()) {
        const lines = transfer.trimEnd().split('\n');
        for (const p of plans) {
          const i = p.line % lines.length;
          if (p.kind === 'json') {
            try {
              lines[i] = mutateJson(lines[i] ?? '', p.plans).replace(/\n\s*/g, '');
            } catch {
              lines[i] = '{';
            }
          } else if (p.kind === 'raw') lines[i] = p.text;
          else if (p.kind === 'drop') lines.splice(i, 1);
          else lines.splice(i, 0, lines[i] ?? '');
        }
        const r = await runCli(['library', 'import', write(`x${k}.jsonl`, `${lines.join('\n')}\n`), '--library', join(dir, `x${k}.sqlite`)]);
        expectSound(r, `transfer case ${k} ${JSON.stringify(plans).slice(0, 400)}`);
        tally('transfers', r);
      }
    });
  });

  it('100 mutated study files: study refuses with a sentence or gives a sound report', async () => {
    // The study names its curve set by a path relative to the study file: keep both side by side.
    for (const f of ['invented-si3-si.curveset.json', 'invented-es4-us.curveset.json']) write(f, readFileSync(join(ROOT, 'samples', 'demo', f), 'utf8'));
    const studies = ['invented-si3.study.json', 'invented-es4.study.json'].map((f) => readFileSync(join(ROOT, 'samples', 'demo', f), 'utf8'));
    const cases = fc.sample(fc.tuple(fc.nat(), fc.array(jsonPlan, { minLength: 1, maxLength: 3 }), fc.boolean()), { seed: SEED + 4, numRuns: 100 });
    for (const [k, [which, plans, json]] of cases.entries()) {
      let text: string;
      try {
        text = mutateJson(studies[which % studies.length] as string, plans);
      } catch {
        text = '{';
      }
      const r = await runCli(['study', write(`s${k}.study.json`, text), ...(json ? ['--json'] : [])]);
      expectSound(r, `study case ${k} ${JSON.stringify(plans).slice(0, 400)}`);
      tally('studies', r);
    }
  });

  it('ran at least 500 cases', () => {
    const total = counts.tables + counts.sets + counts.takeoffs + counts.transfers + counts.studies;
    console.log(`fuzz: ${total} runs; exit 0 / 1 / 2 per input: ${Object.entries(exits).map(([k, [a, b, c]]) => `${k} ${a}/${b}/${c}`).join(', ')}`);
    expect(total, JSON.stringify(counts)).toBeGreaterThanOrEqual(500);
    // Each kind must reach real results too, not refusals alone.
    for (const kind of ['tables', 'sets', 'studies'] as const) expect(exits[kind][0] + exits[kind][1], kind).toBeGreaterThan(counts[kind] / 5);
  });
});

describe('the real binary agrees with the in-process runs', () => {
  // A handful of child processes only: each costs a Node start-up on a shared 2-core machine.
  const tsx = join(ROOT, 'node_modules', 'tsx', 'dist', 'cli.mjs');
  const child = (...args: string[]) => {
    const r = spawnSync(process.execPath, [tsx, join(ROOT, 'src', 'cli', 'main.ts'), ...args], { encoding: 'utf8', timeout: 60_000 });
    return { code: r.status ?? -1, out: r.stdout, err: r.stderr, ms: 0 };
  };

  it('a refusal, a pass and a fail give the same exit codes and one sentence', async () => {
    const junk = write('child-junk.csv', 'quantity,diameter,flow,value\nhead,12,abc,100\n');
    const swapped = TABLES[0]!.text.split('\n');
    const i = swapped.findIndex((l) => l.startsWith('head,12,') && Number(l.split(',')[2]) > 700);
    const c = swapped[i]!.split(',');
    swapped[i] = [c[0], c[1], c[3], c[2]].join(',');
    const cases: [string[], number][] = [
      [['build', junk, '-o', join(dir, 'child-junk.json'), '--units', 'us', '--speed', '1780'], 2],
      [['check', join(ROOT, 'samples', 'demo', 'invented-si3-si.curveset.json')], 0],
      [['build', write('child-swapped.csv', swapped.join('\n')), '-o', join(dir, 'child-swapped.json'), '--units', 'us', '--speed', '1780'], 1],
    ];
    for (const [args, code] of cases) {
      const real = child(...args);
      const inProcess = await runCli(args);
      expect(real.code, `${args.join(' ')}\n${real.err}`).toBe(code);
      expect(inProcess.code).toBe(code);
      expectSound(real, `child ${args[0]}`);
      if (code === 2) expect(real.err).toBe(inProcess.err);
    }
  });
});
