import { describe, expect, it } from 'vitest';
import { spawnSync } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { Panel } from '../../src/model/takeoff.ts';
import { calibrate } from '../../src/digitize/calibration.ts';
import { LAYOUT, makePumpSheetPdf } from './fixtures/pumpSheet.ts';
import { drawPdf } from './fixtures/pdfBytes.ts';

const root = join(import.meta.dirname, '..', '..');
const run = (...args: string[]) =>
  spawnSync(process.execPath, [join(root, 'node_modules', 'tsx', 'dist', 'cli.mjs'), join(root, 'src', 'cli', 'main.ts'), ...args], { encoding: 'utf8' });

describe('pumpscribe panels', () => {
  it('prints proposed panels that a take-off file accepts and that calibrate the sheet', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'pumpscribe-panels-'));
    writeFileSync(join(dir, 'sheet.pdf'), await makePumpSheetPdf());
    const r = run('panels', join(dir, 'sheet.pdf'));
    expect(r.status).toBe(0);
    const panels = (JSON.parse(r.stdout) as { panels: unknown[] }).panels.map((p) => Panel.parse(p));
    expect(panels).toHaveLength(3);
    const cal = calibrate(panels[0]!.anchors, { xScale: panels[0]!.x_scale, yScale: panels[0]!.y_scale });
    const d = cal.toData([LAYOUT.x(1000), LAYOUT.head.y(150)]);
    expect(d[0]).toBeCloseTo(1000, 3); // anchors are rounded to 1e-4 sheet units
    expect(d[1]).toBeCloseTo(150, 3);

    writeFileSync(join(dir, 'blank.pdf'), await drawPdf(200, 200, (dr) => dr.text('no axes here', 20, 20)));
    const blank = run('panels', join(dir, 'blank.pdf'));
    expect(blank.status).toBe(2);
    expect(blank.stderr).toMatch(/^pumpscribe: No numeric tick labels lined up/);
  });
});
