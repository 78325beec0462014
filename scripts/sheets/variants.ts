/**
 * Ready-made sets of INVENTED sample sheets: the few small ones committed in samples/sheets,
 * and the full set over layouts, inks, unit systems, faults, vector and scan.
 */
import type { Variant } from './makeSheet.ts';
import type { ScanSpec } from './renderRaster.ts';

const scan = (dpi: number, rotationDeg: number, seed: number, extra: Partial<ScanSpec> = {}): ScanSpec => ({ dpi, rotationDeg, noise: 5, blur: 0.7, jpegQuality: 80, seed, ...extra });

/** The committed samples: small files (vector PDFs of about 30 KB, two 200-dpi scans, one scan inside a PDF). */
export const SAMPLE_VARIANTS: Variant[] = [
  { spec: { name: 'us-iso-colour', system: 'us', layout: 'iso', ink: 'colour', seed: 1 } },
  { spec: { name: 'si-panels-black', system: 'si', layout: 'panels', ink: 'black', labelsOnLines: true, seed: 2 } },
  { spec: { name: 'us-iso-black-scan', system: 'us', layout: 'iso', ink: 'black', seed: 3 }, scan: scan(200, 1.0, 3) },
  { spec: { name: 'si-panels-colour-scan', system: 'si', layout: 'panels', ink: 'colour', labelsOnLines: true, seed: 4 }, scan: scan(200, -1.3, 4) },
  { spec: { name: 'us-iso-colour-scan-pdf', system: 'us', layout: 'iso', ink: 'colour', labelsOnLines: true, seed: 7 }, scan: scan(200, 0.8, 7, { noise: 4 }), container: 'pdf' },
  { spec: { name: 'us-iso-colour-affinity-fault', system: 'us', layout: 'iso', ink: 'colour', fault: 'announced-diameter', seed: 5 } },
  { spec: { name: 'us-iso-colour-power-fault', system: 'us', layout: 'iso', ink: 'colour', fault: 'power-high', seed: 6 } },
];

/** Every combination, as vector PDFs and as 300-dpi scans turned up to 1.5°, a scan inside a PDF per unit system, plus the faulty sheets. */
export const ALL_VARIANTS: Variant[] = (() => {
  const out: Variant[] = [];
  let seed = 10;
  for (const system of ['us', 'si'] as const) {
    for (const layout of ['iso', 'panels'] as const) {
      for (const ink of ['colour', 'black'] as const) {
        const name = `${system}-${layout}-${ink}`;
        const labelsOnLines = seed % 2 === 0;
        out.push({ spec: { name, system, layout, ink, labelsOnLines, seed } });
        out.push({ spec: { name: `${name}-scan`, system, layout, ink, labelsOnLines, seed }, scan: scan(300, ((seed % 7) - 3) * 0.5, seed, { noise: 8, jpegQuality: 75 }) });
        seed++;
      }
    }
    out.push({ spec: { name: `${system}-iso-colour-scan-pdf`, system, layout: 'iso', ink: 'colour', labelsOnLines: true, seed }, scan: scan(250, -0.9, seed), container: 'pdf' });
    for (const fault of ['announced-diameter', 'power-high'] as const) {
      const name = `${system}-iso-colour-${fault === 'power-high' ? 'power' : 'affinity'}-fault`;
      out.push({ spec: { name, system, layout: 'iso', ink: 'colour', fault, seed } });
      out.push({ spec: { name: `${name}-scan`, system, layout: 'iso', ink: 'colour', fault, seed }, scan: scan(250, 0.8, seed) });
      seed++;
    }
  }
  return out;
})();
