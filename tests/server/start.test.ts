import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, tempDir } from './helpers.ts';
import { parsePort, startServer } from '../../src/server/start.ts';

let tmp: ReturnType<typeof tempDir>;
beforeEach(() => {
  tmp = tempDir();
});
afterEach(() => tmp.remove());

describe('starting the server', () => {
  it('seeds a new library from the demo folder, says they are invented, and names the library file', async () => {
    const demo = join(tmp.dir, 'demo');
    mkdirSync(demo);
    writeFileSync(join(demo, 'a.curveset.json'), JSON.stringify(inventedCurveSet(FAMILIES.small)));
    writeFileSync(join(demo, 'b.curveset.json'), JSON.stringify(inventedCurveSet(FAMILIES.large)));
    writeFileSync(join(demo, 'broken.curveset.json'), '{"format": "pumpscribe.curveset"}');
    const library = join(tmp.dir, 'office.sqlite');
    const say: string[] = [];
    const first = await startServer({ port: 0, library, demoDir: demo, say: (l) => say.push(l), staticDir: tmp.dir });
    try {
      const text = say.join('\n');
      expect(text).toContain(library);
      expect(text).toMatch(/2 demo curve sets .* invented demo entries/);
      expect(text).toMatch(/Skipped demo file broken\.curveset\.json/);
      expect(first.url).toMatch(/^http:\/\/127\.0\.0\.1:\d+\/$/);
      const list = await json(`${first.url}api/curvesets`);
      expect(list.body.total).toBe(2);
      const home = await fetch(first.url);
      expect(home.headers.get('content-type')).toMatch(/text\/html/);
      expect(await home.text()).toContain(FAMILIES.small.name);
    } finally {
      await first.close();
    }
    const again: string[] = [];
    const second = await startServer({ port: 0, library, demoDir: demo, say: (l) => again.push(l), staticDir: tmp.dir });
    try {
      expect(again.join('\n')).not.toMatch(/Seeded/);
      expect((await json(`${second.url}api/curvesets`)).body.total).toBe(2);
    } finally {
      await second.close();
    }
  });

  it('serves a built workbench from its folder, and the library page beside it', async () => {
    const dist = join(tmp.dir, 'dist');
    mkdirSync(join(dist, 'assets'), { recursive: true });
    writeFileSync(join(dist, 'index.html'), '<!doctype html><title>invented workbench build</title>');
    writeFileSync(join(dist, 'assets', 'app.js'), 'console.log("invented")');
    const running = await startServer({ port: 0, library: join(tmp.dir, 'w.sqlite'), staticDir: dist, seed: false, say: () => {} });
    try {
      expect(await (await fetch(running.url)).text()).toContain('invented workbench build');
      expect((await fetch(`${running.url}assets/app.js`)).status).toBe(200);
      expect(await (await fetch(`${running.url}library`)).text()).toContain('Office pump library');
      expect((await fetch(`${running.url}api/nothing`)).status).toBe(404);
    } finally {
      await running.close();
    }
  });

  it('refuses a port that is not a whole number from 0 to 65535, and a port already in use', async () => {
    expect(() => parsePort('80x')).toThrow(/port/);
    expect(() => parsePort('70000')).toThrow(/port/);
    expect(parsePort('0')).toBe(0);
    const a = await startServer({ port: 0, library: join(tmp.dir, 'p.sqlite'), seed: false, say: () => {}, staticDir: tmp.dir });
    try {
      const port = new URL(a.url).port;
      await expect(startServer({ port, library: join(tmp.dir, 'q.sqlite'), seed: false, say: () => {}, staticDir: tmp.dir })).rejects.toThrow(/already in use/);
    } finally {
      await a.close();
    }
  });
});
