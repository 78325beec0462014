import { afterEach, beforeEach, describe, expect, it } from 'vitest';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { FAMILIES, inventedCurveSet } from '../library/fixtures.ts';
import { json, tempDir } from './helpers.ts';
import { parsePort, startServer } from '../../src/server/start.ts';
import { request as httpRequest } from 'node:http';
import { spawn } from 'node:child_process';

function rawGet(base: string, path: string): Promise<{ status: number; body: string }> {
  const u = new URL(base);
  return new Promise((resolve, reject) => {
    const req = httpRequest({ host: u.hostname, port: u.port, path, method: 'GET' }, (res) => {
      let body = '';
      res.on('data', (c) => (body += c));
      res.on('end', () => resolve({ status: res.statusCode ?? 0, body }));
    });
    req.on('error', reject);
    req.end();
  });
}

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
      // Static serving stays inside the build folder: a file beside it is never reachable.
      writeFileSync(join(tmp.dir, 'secret.txt'), 'invented secret beside dist');
      for (const path of ['/../secret.txt', '/%2e%2e/secret.txt', '/assets/../../secret.txt', '/assets/%2e%2e%2f%2e%2e%2fsecret.txt', '/..%5csecret.txt']) {
        const res = await rawGet(running.url, path);
        expect(res.body, path).not.toContain('invented secret');
      }
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

  it('pumpscribe serve names the library file, serves it, and closes cleanly on SIGINT', async () => {
    const library = join(tmp.dir, 'cli.sqlite');
    const child = spawn(process.execPath, [join('node_modules', 'tsx', 'dist', 'cli.mjs'), 'src/cli/main.ts', 'serve', '--port', '0', '--library', library, '--no-seed'], {
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    let out = '';
    const exited = new Promise<number>((resolve) => child.on('exit', (code) => resolve(code ?? -1)));
    const url = await new Promise<string>((resolve, reject) => {
      child.stdout.on('data', (c: Buffer) => {
        out += c.toString();
        const m = /serving at (http:\/\/127\.0\.0\.1:\d+\/)/.exec(out);
        if (m && out.includes('Press Ctrl+C')) resolve(m[1] as string);
      });
      child.on('exit', () => reject(new Error(`serve exited early: ${out}`)));
    });
    expect(out).toContain(`Library file: ${library}`);
    expect((await json(`${url}api/health`)).body.ok).toBe(true);
    child.kill('SIGINT');
    expect(await exited).toBe(0);
    expect(out).toContain('Stopped; the library file is closed.');
  });
});
