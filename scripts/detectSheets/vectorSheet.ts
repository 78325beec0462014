/**
 * Vector PDF sheets from the independent random bed (scripts/randomSheets), for the automatic
 * take-off: the bed's plan and SVG, printed by Chromium to a PDF page (paths and a text
 * layer, no camera), with the exact truth of every curve and label in PDF points.
 *
 * Chromium prints one CSS pixel as 0.75 pt, so a flat page pixel of the plan is 0.75 sheet
 * units of the PDF. Nothing here is shared with the detector: the truth comes from the plan.
 */
import { chromium, type Browser } from 'playwright-core';
import { Dice } from '../randomSheets/dice.ts';
import { planSheet, type SheetPlan } from '../randomSheets/plan.ts';
import { UNIT_NAMES } from '../randomSheets/pumpFamily.ts';
import { sheetSvg } from '../randomSheets/svg.ts';
import { truthOf as truthOfPlan, type TruthCurve } from '../randomSheets/randomSheet.ts';

export const CHROMIUM = process.env.PUMPSCRIBE_CHROMIUM ?? '/usr/bin/chromium';
const FLAGS = ['--headless', '--no-sandbox', '--disable-gpu', '--no-first-run', '--disable-background-networking', '--disable-component-update', '--disable-sync'];

/** Sheet units (PDF points) per flat page pixel of the plan. */
export const PT_PER_PX = 0.75;

export interface VectorSheet {
  seed: number;
  plan: SheetPlan;
  pdf: Uint8Array;
  truth: TruthCurve[];
  /** What the detector should find: panels (by quantity), curves, iso levels. */
  expected: { panels: string[]; curves: { quantity: string; diameter: number }[]; isoLevels: number[]; labelled: boolean };
}

export async function openPrinter(): Promise<Browser> {
  return chromium.launch({ executablePath: CHROMIUM, headless: true, args: FLAGS });
}

export async function printSvg(browser: Browser, svg: string, width: number, height: number): Promise<Uint8Array> {
  const page = await browser.newPage();
  try {
    const html = `<!doctype html><html><head><style>@page{size:${width}px ${height}px;margin:0}html,body{margin:0;padding:0}svg{display:block}</style></head><body>${svg}</body></html>`;
    await page.setContent(html);
    const pdf = await page.pdf({ width: `${width}px`, height: `${height}px`, printBackground: true, pageRanges: '1', margin: { top: '0', right: '0', bottom: '0', left: '0' } });
    return new Uint8Array(pdf);
  } finally {
    await page.close();
  }
}

/** The truth of a plan, as the bed scores it (the random bed's own rule), without the bed's trace ids. */
export function truthOf(plan: SheetPlan): TruthCurve[] {
  return truthOfPlan(plan).map((t) => ({ ...t, traces: [] }));
}

export async function makeVectorSheet(browser: Browser, seed: number): Promise<VectorSheet> {
  const plan = planSheet(new Dice(seed));
  const pdf = await printSvg(browser, sheetSvg(plan), plan.width, plan.height);
  const curves = plan.lines.filter((l) => l.diameter !== undefined).map((l) => ({ quantity: l.quantity, diameter: l.diameter as number }));
  const isoLevels = plan.lines.filter((l) => l.iso !== undefined).map((l) => l.iso as number);
  const labelled = plan.lines.some((l) => l.diameter !== undefined && l.label !== undefined);
  return { seed, plan, pdf, truth: truthOf(plan), expected: { panels: plan.panels.map((p) => p.quantity), curves, isoLevels, labelled } };
}

/** The minimal take-off the detector starts from: sheet, page, speed and units. */
export function minimalTakeoff(plan: SheetPlan, sheet: string): Record<string, unknown> {
  const u = UNIT_NAMES[plan.family.units];
  return {
    sheet,
    page: 1,
    pump: { name: `Invented random family (not a real product)`, speed_rpm: plan.family.speed },
    units: { flow: u.flow, head: u.head, power: u.power, npsh: u.npsh, diameter: u.diameter },
  };
}
