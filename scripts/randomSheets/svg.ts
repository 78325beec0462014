/**
 * Writes a sheet plan as an SVG document in flat page pixels: paper, grid, frames, tick
 * labels, axis titles, the lines with their dash patterns, and labels (a label "on" a line
 * sits on a paper-coloured box that interrupts the line, as printed sheets do).
 * The SVG is rasterised by the SVG renderer of @napi-rs/canvas (see camera.ts), a different
 * drawing path from scripts/sheets, which paints with canvas calls.
 */
import { UNIT_NAMES } from './pumpFamily.ts';
import type { LinePlan, PanelPlan, SheetPlan } from './plan.ts';

/**
 * The version of what this renderer draws. Every cache of rendered sheets (artifacts/random-sheets,
 * artifacts/detect-sheets, artifacts/speed-sheets) is keyed by it: bump it when a sheet's
 * picture changes, so that no bed scores a stale picture.
 * v2: tick labels carry the step's decimals (a 2.5 step printed "13" for 12.5 in v1).
 */
export const RENDER_VERSION = 'v2';

/** The decimals a tick label needs for every multiple of this step to print exactly (2.5 → 1, 0.25 → 2). */
export function tickDecimals(step: number): number {
  for (let d = 0; d < 4; d++) if (Math.abs(step * 10 ** d - Math.round(step * 10 ** d)) < 1e-6 * Math.max(1, step * 10 ** d)) return d;
  return 4;
}

const esc = (s: string) => s.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;');
const n = (v: number) => Number(v.toFixed(2));

function gridAndAxes(plan: SheetPlan, panel: PanelPlan, out: string[]): void {
  const [l, t, r, b] = panel.frame;
  const fs = plan.fontPx;
  const { x, y } = panel;
  const xAt = (v: number) => l + ((v - x.min) / (x.max - x.min)) * (r - l);
  const yAt = (v: number) => b - ((v - y.min) / (y.max - y.min)) * (b - t);
  if (panel.side === 'left') {
    const g = plan.grid;
    if (g.minor > 0) {
      const mx = x.step / g.minor;
      const my = y.step / g.minor;
      for (let v = x.min + mx; v < x.max - 1e-9; v += mx) out.push(`<line x1="${n(xAt(v))}" y1="${n(t)}" x2="${n(xAt(v))}" y2="${n(b)}" stroke="${g.colour}" stroke-width="${n(0.5 * g.width)}" opacity="0.6"/>`);
      for (let v = y.min + my; v < y.max - 1e-9; v += my) out.push(`<line x1="${n(l)}" y1="${n(yAt(v))}" x2="${n(r)}" y2="${n(yAt(v))}" stroke="${g.colour}" stroke-width="${n(0.5 * g.width)}" opacity="0.6"/>`);
    }
    for (let v = x.min; v <= x.max + 1e-9; v += x.step) {
      out.push(`<line x1="${n(xAt(v))}" y1="${n(t)}" x2="${n(xAt(v))}" y2="${n(b)}" stroke="${g.colour}" stroke-width="${n(g.width)}"/>`);
      out.push(`<text x="${n(xAt(v))}" y="${n(b + 1.3 * fs)}" font-size="${n(fs)}" text-anchor="middle" font-family="sans-serif">${v.toFixed(tickDecimals(x.step))}</text>`);
    }
    for (let v = y.min; v <= y.max + 1e-9; v += y.step) {
      out.push(`<line x1="${n(l)}" y1="${n(yAt(v))}" x2="${n(r)}" y2="${n(yAt(v))}" stroke="${g.colour}" stroke-width="${n(g.width)}"/>`);
    }
    out.push(`<rect x="${n(l)}" y="${n(t)}" width="${n(r - l)}" height="${n(b - t)}" fill="none" stroke="#000" stroke-width="${n(Math.max(1, plan.dpi / 150))}"/>`);
    const u = UNIT_NAMES[plan.family.units];
    out.push(`<text x="${n((l + r) / 2)}" y="${n(b + 2.6 * fs)}" font-size="${n(fs)}" text-anchor="middle" font-family="sans-serif">Flow Q (${u.flow})</text>`);
  }
  const u = UNIT_NAMES[plan.family.units];
  const title = { head: `Head (${u.head})`, efficiency: 'Efficiency (%)', power: `Power (${u.power})`, npshr: `NPSHr (${u.npsh})` }[panel.quantity];
  const xText = panel.side === 'left' ? l - 0.4 * fs : r + 0.4 * fs;
  for (let v = y.min; v <= y.max + 1e-9; v += y.step) {
    out.push(`<text x="${n(xText)}" y="${n(yAt(v) + 0.35 * fs)}" font-size="${n(fs)}" text-anchor="${panel.side === 'left' ? 'end' : 'start'}" font-family="sans-serif">${v.toFixed(tickDecimals(y.step))}</text>`);
  }
  const tx = panel.side === 'left' ? l - 3.2 * fs : r + 3.2 * fs;
  out.push(`<text x="${n(tx)}" y="${n((t + b) / 2)}" font-size="${n(fs)}" text-anchor="middle" font-family="sans-serif" transform="rotate(-90 ${n(tx)} ${n((t + b) / 2)})">${esc(title)}</text>`);
}

function path(points: readonly [number, number][]): string {
  return points.map((p, i) => `${i === 0 ? 'M' : 'L'}${n(p[0])} ${n(p[1])}`).join(' ');
}

function lineSvg(line: LinePlan): string {
  const s = line.style;
  const dash = s.pattern.length ? ` stroke-dasharray="${s.pattern.map(n).join(' ')}"` : '';
  const cap = s.dash === 'dotted' ? 'round' : 'butt';
  return `<path d="${path(line.points)}" fill="none" stroke="${s.colour}" stroke-width="${n(s.width)}" stroke-linecap="${cap}" stroke-linejoin="round"${dash}/>`;
}

function labelSvg(plan: SheetPlan, line: LinePlan): string {
  if (!line.label) return '';
  const fs = 0.9 * plan.fontPx;
  const k = Math.round(line.label.at * (line.points.length - 1));
  const p = line.points[k] as [number, number];
  const w = 0.55 * fs * line.label.text.length;
  if (line.label.mode === 'on') {
    return `<rect x="${n(p[0] - w / 2 - 1)}" y="${n(p[1] - 0.6 * fs)}" width="${n(w + 2)}" height="${n(1.2 * fs)}" fill="#ffffff"/><text x="${n(p[0])}" y="${n(p[1] + 0.35 * fs)}" font-size="${n(fs)}" text-anchor="middle" fill="${line.style.colour}" font-family="sans-serif">${esc(line.label.text)}</text>`;
  }
  const end = line.points[line.points.length - 1] as [number, number];
  return `<text x="${n(end[0] + 0.3 * fs)}" y="${n(end[1] - 0.3 * fs)}" font-size="${n(fs)}" fill="${line.style.colour}" font-family="sans-serif">${esc(line.label.text)}</text>`;
}

export function sheetSvg(plan: SheetPlan): string {
  const out: string[] = [];
  out.push(`<svg xmlns="http://www.w3.org/2000/svg" width="${plan.width}" height="${plan.height}" viewBox="0 0 ${plan.width} ${plan.height}">`);
  out.push(`<rect x="0" y="0" width="${plan.width}" height="${plan.height}" fill="#ffffff"/>`);
  out.push(`<text x="${n(plan.width / 2)}" y="${n(1.8 * plan.fontPx)}" font-size="${n(1.3 * plan.fontPx)}" text-anchor="middle" font-family="sans-serif">INVENTED test family (not a real product) · ${plan.family.speed} rpm</text>`);
  for (const p of plan.panels) gridAndAxes(plan, p, out);
  for (const l of plan.lines) out.push(lineSvg(l));
  for (const l of plan.lines) out.push(labelSvg(plan, l));
  out.push('</svg>');
  return out.join('\n');
}
