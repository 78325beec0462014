/**
 * The selection record of an invented vector sheet and an invented scan: rendered to PNG by
 * pdftoppm (poppler-utils; CI must install it), opened by pdf.js without warnings, its text read
 * back and the figures it shows found in it; made in under 3 s for a four-panel sheet.
 */
import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { makeRecord } from '../../src/record/makeRecord.ts';
import { PAPER } from '../../src/record/recordPdf.ts';
import { stringifyCurveSet } from '../../src/model/curvesetIO.ts';
import { formatNumber } from '../../src/units/index.ts';
import { studyView } from '../../src/study/view.ts';
import { studyUnitSystem } from '../../src/study/resolve.ts';
import { hasPdftotext, oneLine, pdfText, popplerText, shownFigures } from './recordText.ts';
import { recordInput, sample, SHEETS, SI_STUDY } from './samples.ts';

const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-record-'));
const pdftoppm = spawnSync('pdftoppm', ['-v'], { encoding: 'utf8' }).error === undefined;
if (!pdftoppm || !hasPdftotext) console.warn('pdftoppm or pdftotext is not installed: the PNG rendering and poppler text checks are skipped. Install poppler-utils (apt-get install -y poppler-utils); CI must install it.');

async function record(name: string, paper: 'a4' | 'letter' = 'a4') {
  const s = await sample(name);
  const input = recordInput(name, s, paper, 'record-test.study.json', '2026-01-01T00:00:00.000Z');
  const made = await makeRecord(input);
  return { s, made };
}

describe.each([
  ['si-panels-black', 'vector'],
  ['si-panels-colour-scan', 'scan'],
])('record of %s (%s)', (name) => {
  it('opens in pdf.js without warnings, and its text holds the figures it shows (its time: `npm run bench -- record`)', async () => {
    const { s, made } = await record(name);
    const file = join(dir, `${name}.pdf`);
    writeFileSync(file, made.pdf);
    const got = await pdfText(made.pdf);
    expect(got.warnings).toEqual([]);
    expect(got.pages).toBeGreaterThanOrEqual(5);
    for (const size of got.sizes) expect(size.map(Math.round)).toEqual(PAPER.a4.map(Math.round));
    const v = studyView(s.result, studyUnitSystem(s.result.study), { file: 'x' });
    const text = oneLine(got.pageText.join('\n'));
    for (const o of v.options) {
      expect(text).toContain(o.name);
      expect(text).toContain(formatNumber(o.flow as number, 4)); // operating (duty) flow
      expect(text).toContain(formatNumber(o.head as number, 4)); // head at the duty
      expect(text).toContain(o.motor_rating as string); // motor rating
      const op = o.operating_points.high_static;
      if (op) expect(text).toContain(`${formatNumber(op.flow as number, 4)} m³/h at ${formatNumber(op.head as number, 4)} m`);
    }
    expect(text).toContain(s.sha256);
    expect(text).toMatch(/verify against certified data and local codes; a licensed professional approves/);
    // The caution stands on every page.
    expect(got.pageText.filter((p) => oneLine(p).includes('a licensed professional approves')).length).toBe(got.pages);
    // Selectable text: every figure shown is in the text layer, read by pdf.js and by poppler.
    const figures = shownFigures(s.result, made.overlay);
    expect(figures.length).toBeGreaterThan(30);
    for (const figure of figures) expect(text, figure).toContain(figure);
    if (!pdftoppm || !hasPdftotext) return;
    const poppler = popplerText(file);
    expect(poppler.status, poppler.stderr).toBe(0);
    expect(poppler.stderr).toBe('');
    expect(poppler.pages.length).toBe(got.pages);
    const popText = oneLine(poppler.pages.join('\n'));
    for (const figure of figures) expect(popText, `pdftotext: ${figure}`).toContain(figure);
    for (const p of poppler.pages) expect(oneLine(p)).toContain('a licensed professional approves');
    const r = spawnSync('pdftoppm', ['-r', '50', '-png', file, join(dir, name)], { encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
    expect(r.stderr).toBe('');
    const pngs = readdirSync(dir).filter((f) => f.startsWith(name) && f.endsWith('.png'));
    expect(pngs.length).toBe(got.pages);
    for (const p of pngs) expect(statSync(join(dir, p)).size).toBeGreaterThan(2000);
  }, 120_000);
});

it('is made on US Letter when asked', async () => {
  const { made } = await record('si-panels-black', 'letter');
  const got = await pdfText(made.pdf);
  for (const size of got.sizes) expect(size).toEqual([...PAPER.letter]);
}, 120_000);

describe('pumpscribe report', () => {
  const run = (...args: string[]) => {
    const r = spawnSync(process.execPath, [join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'src/cli/main.ts', ...args], { encoding: 'utf8' });
    return { code: r.status, out: r.stdout, err: r.stderr };
  };
  it('writes the record of a take-off and a study', async () => {
    const s = await sample('si-panels-black');
    writeFileSync(join(dir, 'sheet.curveset.json'), stringifyCurveSet(s.replay.curveSet));
    writeFileSync(join(dir, 'record.study.json'), JSON.stringify(SI_STUDY));
    const out = join(dir, 'cli-record.pdf');
    const r = run('report', '--takeoff', resolve(SHEETS, 'si-panels-black.takeoff.json'), '--study', join(dir, 'record.study.json'), '-o', out, '--paper', 'letter');
    expect(r.err).toMatch(/Wrote .*cli-record\.pdf/);
    expect(r.code).toBe(0);
    expect(existsSync(out)).toBe(true);
    const got = await pdfText(new Uint8Array(readFileSync(out)));
    expect(got.warnings).toEqual([]);
    expect(got.pageText.join('\n')).toContain('75 kW');
  }, 180_000);

  it('refuses a bad paper size with one sentence and exit 2', () => {
    const r = run('report', '--takeoff', 'x.takeoff.json', '--study', 'y.study.json', '-o', join(dir, 'x.pdf'), '--paper', 'a3');
    expect(r.code).toBe(2);
    expect(r.err.trim()).toMatch(/^.*--paper must be "a4" or "letter", not "a3"\.$/);
  });
});
