/**
 * A head label the reader itself is unsure of: a digit misread on a blurred sheet ("328" for
 * 329) keeps the order and the affinity rule, so nothing else catches it. On an INVENTED scan
 * of the random bed whose three head curves are named from their labels, the reader's
 * confidence in one label is lowered below its siblings': its curve, and every curve named after
 * it on the other panels, comes back unsure, and the sheet asks once, naming the label. With the
 * reader as it is, the same scan asks nothing of the kind. And the bed's photo 66, where the
 * reader really reads "328 mm" for 329 mm, asks.
 */
import { afterAll, describe, expect, it } from 'vitest';
import { detectTakeoff } from '../../src/digitize/detect/detect.ts';
import { LABEL_READ_GAP, LABEL_READ_SURE } from '../../src/digitize/detect/rasterCurves.ts';
import type { TextReader } from '../../src/digitize/detect/rasterText.ts';
import { loadImageSheetNode } from '../../src/digitize/loaders/imageNode.ts';
import { closeTextReaderNode, textReaderNode } from '../../src/digitize/loaders/ocrNode.ts';
import { parseTakeoffToDetect } from '../../src/model/takeoff.ts';
import { scanFor } from '../../scripts/detectSheets/scanBed.ts';
import { sheetGeometry } from '../../scripts/randomSheets/randomSheet.ts';

afterAll(() => closeTextReaderNode());

const SEED = 20;

async function detect(reader: TextReader, seed = SEED, kind: 'scan' | 'photo' = 'scan') {
  const { jpeg, takeoff } = await scanFor(seed, kind);
  const sheet = await loadImageSheetNode(jpeg, { name: `${seed}.jpg` });
  const raw: Record<string, unknown> = { ...takeoff, sheet: `${seed}.jpg` };
  delete raw.panels;
  delete raw.traces;
  return detectTakeoff(parseTakeoffToDetect(raw), raw, sheet, { reader });
}

describe('a head label read with little certainty', () => {
  it('leaves its curve and the curves named after it unsure, and the sheet asks naming the label', { timeout: 180_000 }, async () => {
    const plain = await detect(textReaderNode());
    const heads = plain.takeoff.traces.filter((t) => t.quantity === 'head');
    expect(heads.length).toBeGreaterThanOrEqual(3);
    expect(plain.questions.some((q) => /little certainty/.test(q))).toBe(false);

    // The same sheet, the reader unsure of the first curve label it reads (a label with its unit).
    const real = textReaderNode();
    let doubted = '';
    const reader: TextReader = {
      async read(image, what) {
        const words = await real.read(image, what);
        if (what !== 'words' || doubted !== '') return words;
        // The first curve label's number (the reader gives "377" and "mm" as two words; a crop's reading is its words joined).
        if (!words.some((w) => /^mm$/.test(w.text.trim()))) return words;
        const label = words.find((w) => /^\d{2,4}$/.test(w.text.trim()));
        if (!label) return words;
        doubted = label.text.trim();
        // Well under the sure mark and its siblings' (LABEL_READ_GAP below them).
        return words.map((w) => (w === label ? { ...w, confidence: Math.min(LABEL_READ_SURE - 1, w.confidence - LABEL_READ_GAP - 40) } : w));
      },
    };
    const unsure = await detect(reader);
    expect(doubted).not.toBe('');
    const value = Number(/^[\d.]+/.exec(doubted)?.[0]);
    const asked = unsure.questions.filter((q) => /read with little certainty/.test(q));
    expect(asked).toHaveLength(1);
    expect(asked[0]).toContain(`"${doubted} mm"`);
    const named = unsure.takeoff.traces.filter((t) => t.diameter === value);
    expect(named.length).toBeGreaterThanOrEqual(2); // its head curve and at least one curve of another panel
    for (const t of named) expect(t.confidence).toBeLessThan(0.5);
    // Their doubt is the label's, said in its own question: the tracer is not blamed for them.
    const sureBefore = named.filter((t) => (plain.takeoff.traces.find((k) => k.id === t.id)?.confidence ?? 0) >= 0.5);
    expect(sureBefore.length).toBeGreaterThan(0);
    const blamed = unsure.questions.join(' ').match(/disagree for ([^(]*)\(/)?.[1] ?? '';
    for (const t of sureBefore) expect(blamed).not.toContain(`"${t.id}"`);
    // The other curves keep their confidence.
    for (const t of unsure.takeoff.traces.filter((k) => k.diameter !== value)) {
      const before = plain.takeoff.traces.find((k) => k.id === t.id);
      expect(t.confidence).toBe(before?.confidence);
    }
  });

  it('on the photo where the reader takes a 9 for an 8, the curves of that label are unsure and the sheet asks', { timeout: 180_000 }, async () => {
    const { plan } = sheetGeometry(66, 'photo');
    expect(plan.family.diameters).toContain(329);
    const found = await detect(textReaderNode(), 66, 'photo');
    const misread = found.takeoff.traces.filter((t) => t.diameter !== undefined && !plan.family.diameters.includes(t.diameter));
    for (const t of misread) expect(t.confidence).toBeLessThan(0.5);
    if (misread.length > 0) expect(found.questions.some((q) => /read with little certainty/.test(q))).toBe(true);
  });
});

/** Every head curve of a bed scan named from its label, and no question asking for the diameters. */
async function expectNamedFromLabels(seed: number): Promise<void> {
  const { plan } = sheetGeometry(seed, 'scan');
  const found = await detect(textReaderNode(), seed);
  expect(found.questions.some((q) => /give the diameters/.test(q))).toBe(false);
  const heads = found.takeoff.traces.filter((t) => t.quantity === 'head').map((t) => t.diameter).sort((a, b) => (b ?? 0) - (a ?? 0));
  expect(heads).toEqual([...plan.family.diameters].sort((a, b) => b - a));
}

describe('head labels the first readings missed', () => {
  it('a label printed on its line where the line found stops under its letters names that line (bed scan 42)', { timeout: 180_000 }, async () => {
    // INVENTED bed scan 42, 200 dpi, five head curves labelled on the line ("380 mm" …): the line
    // found for the top curve stops inside its label's box, and the tracer keeps a point only every
    // 90 px there, so the label had been taken for the curve 79 px below, and the sheet asked for
    // all five diameters.
    await expectNamedFromLabels(42);
  });

  it('a label whose number the word finder lost is read again from its left (bed scan 50)', { timeout: 180_000 }, async () => {
    // INVENTED bed scan 50, 240 dpi: "208 mm" printed on its line came out as the word "mm" alone
    // (its digits run together with the line), and "260 mm" as "260m".
    await expectNamedFromLabels(50);
  });
});

describe('an iso label of weaker evidence that the reading among the others passes over', () => {
  it('is read alone, larger, twice: the "60%" of bed scan 35 gives its line a level', { timeout: 180_000 }, async () => {
    // INVENTED bed scan 35, 240 dpi: a grey "60%" printed on the end of an iso-line, taken as
    // glyphs run together, read as nothing among the specks read with it, nor alone up to 70 px
    // of text height; read alone at 80 and 120 px it gives "60%" both times.
    let found;
    try {
      found = await detect(textReaderNode(), 35);
    } catch (error) {
      found = { questions: [(error as Error).message] };
    }
    expect(found.questions.join(' ')).toMatch(/levels read: 60 %/);
  });
});

