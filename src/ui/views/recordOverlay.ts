/**
 * The study on the sheet in the workbench: the same overlay the selection record draws
 * (src/record/overlay.ts), painted on the sheet canvas when the engineer switches it on.
 * Options keep their record line styles and colours.
 */
import { buildOverlay, type Overlay } from '../../record/overlay.ts';
import { calibratePanels } from '../../digitize/calibration.ts';
import type { Takeoff } from '../../model/takeoff.ts';
import type { StudyResult } from '../../study/runStudy.ts';
import { toScreen, type View } from '../canvas/view.ts';

let memo: { takeoff: Takeoff; result: StudyResult; overlay: Overlay | null } | null = null;

/** The overlay for this take-off and study result (remembered until either changes); null when it cannot be drawn. */
export function studyOverlay(takeoff: Takeoff | null, result: StudyResult | null): Overlay | null {
  if (!takeoff || !result) return null;
  if (memo && memo.takeoff === takeoff && memo.result === result) return memo.overlay;
  let overlay: Overlay | null = null;
  try {
    const { calibrations } = calibratePanels(takeoff.panels);
    overlay = buildOverlay(takeoff, calibrations, result, { samples: 80 });
  } catch {
    overlay = null; // an unusable calibration is reported by the axes step already
  }
  memo = { takeoff, result, overlay };
  return overlay;
}

const rgb = (c: readonly [number, number, number]) => `rgb(${Math.round(c[0] * 255)},${Math.round(c[1] * 255)},${Math.round(c[2] * 255)})`;

/** Paints the overlay on the sheet canvas. */
export function paintStudyOverlay(ctx: CanvasRenderingContext2D, view: View, overlay: Overlay | null): void {
  if (!overlay) return;
  ctx.save();
  for (const panel of overlay.panels) {
    for (const path of panel.paths) {
      const o = overlay.options[path.option];
      if (!o) continue;
      for (const pts of path.lines) {
        ctx.beginPath();
        pts.forEach((p, i) => {
          const [x, y] = toScreen(view, p);
          if (i === 0) ctx.moveTo(x, y);
          else ctx.lineTo(x, y);
        });
        ctx.strokeStyle = rgb(o.colour);
        ctx.globalAlpha = path.kind === 'por' ? 0.3 : 1;
        ctx.lineWidth = path.kind === 'por' ? 7 : path.kind === 'system-low' ? 1.5 : 2;
        ctx.setLineDash(path.kind === 'por' ? [] : o.style.dash.map((d) => d * 1.5));
        ctx.stroke();
      }
    }
    ctx.globalAlpha = 1;
    ctx.setLineDash([]);
    for (const m of panel.marks) {
      const o = overlay.options[m.option];
      if (!o || !m.inside) continue;
      const [x, y] = toScreen(view, m.at);
      ctx.beginPath();
      ctx.arc(x, y, 4.5, 0, 2 * Math.PI);
      ctx.strokeStyle = rgb(o.colour);
      ctx.fillStyle = m.kind === 'operating-high' || m.kind === 'duty' ? rgb(o.colour) : 'rgba(255,255,255,0.9)';
      ctx.fill();
      ctx.lineWidth = 1.5;
      ctx.stroke();
    }
  }
  ctx.restore();
}
