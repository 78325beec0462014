export {};
(globalThis as any).__t = {};
(globalThis as unknown as { __rdLog: string[] }).__rdLog = [];
const { sheetFor } = await import('../../bench/randomSheets.bench.ts');
const { imageSheet } = await import('../../src/digitize/loaders/imageSheet.ts');
const { replayTakeoff } = await import('../../src/digitize/takeoff.ts');
const { parseTakeoff } = await import('../../src/model/takeoff.ts');
const { decode } = await import('../randomSheets/camera.ts');
const { createHash } = await import('node:crypto');
let total = 0;
for (let seed = 1; seed <= 12; seed++) {
  const kind = seed % 3 === 2 ? 'photo' : 'scan';
  const { jpeg, meta } = await sheetFor(seed, kind);
  const decoded = await decode(jpeg);
  const raster = { width: decoded.width, height: decoded.height, data: decoded.data, scale: 1 };
  const sheet = imageSheet(raster, createHash('sha256').update(jpeg).digest('hex'), () => raster);
  const t0 = performance.now();
  await replayTakeoff(parseTakeoff(meta.takeoff), sheet);
  total += performance.now() - t0;
}
const log = (globalThis as unknown as { __rdLog: string[] }).__rdLog;
console.log("time", total.toFixed(0), JSON.stringify((globalThis as any).__t));
console.log('restyle none', log.filter((l) => l.startsWith('DBG restyle none')).length, 'restyle some', log.filter((l) => l.startsWith('DBG restyle width')).length, 'rounds', log.filter((l) => l.startsWith('DBG round')).length, 'adopted', log.filter((l) => l.includes('restyled true') && l.includes('round 0')).length);
console.log(log.filter((l) => l.startsWith('DBG restyle width')).slice(0, 30).join('\n'));
