/**
 * A magnifier beside the cursor: the sheet around the pointer at four times the current
 * zoom (at least two screen pixels per drawn pixel), with a fine cross-hair at the exact
 * point the click will use. It reads the page drawing the canvas already holds.
 */
import type { SheetCanvas } from './sheetCanvas.ts';

const SIZE = 168;

export class Magnifier {
  private readonly el: HTMLCanvasElement;
  private visible = false;

  constructor(private readonly host: HTMLElement, private readonly canvas: SheetCanvas) {
    this.el = document.createElement('canvas');
    this.el.className = 'magnifier';
    this.el.width = SIZE * (window.devicePixelRatio || 1);
    this.el.height = SIZE * (window.devicePixelRatio || 1);
    this.el.style.width = `${SIZE}px`;
    this.el.style.height = `${SIZE}px`;
    this.el.setAttribute('aria-hidden', 'true');
    host.append(this.el);
    this.hide();
  }

  hide(): void {
    if (!this.visible && this.el.style.display === 'none') return;
    this.visible = false;
    this.el.style.display = 'none';
  }

  /**
   * Shows the sheet around `at` (sheet units), with the cursor at screen point `screen`.
   * `mark` is where the click will land after snapping.
   */
  show(at: readonly [number, number], screen: readonly [number, number], mark: readonly [number, number] | null, snapped: boolean): void {
    const detail = this.canvas.detail;
    if (!detail) return this.hide();
    const dpr = window.devicePixelRatio || 1;
    const view = this.canvas.currentView;
    const magnification = Math.max(view.zoom * 4, (2 * detail.scale) / dpr);
    const half = SIZE / 2 / magnification; // sheet units shown either side of the centre
    const ctx = this.el.getContext('2d');
    if (!ctx) return;
    ctx.setTransform(dpr, 0, 0, dpr, 0, 0);
    ctx.fillStyle = '#ffffff';
    ctx.fillRect(0, 0, SIZE, SIZE);
    ctx.imageSmoothingEnabled = magnification * dpr < detail.scale * 2;
    const sx = (at[0] - half) * detail.scale;
    const sy = (at[1] - half) * detail.scale;
    const sw = 2 * half * detail.scale;
    ctx.drawImage(detail.bitmap, sx, sy, sw, sw, 0, 0, SIZE, SIZE);
    // Cross-hair at the pointer, and a ring where the click will land.
    ctx.strokeStyle = 'rgba(17,24,39,0.75)';
    ctx.lineWidth = 1;
    ctx.beginPath();
    ctx.moveTo(SIZE / 2 + 0.5, 0);
    ctx.lineTo(SIZE / 2 + 0.5, SIZE / 2 - 6);
    ctx.moveTo(SIZE / 2 + 0.5, SIZE / 2 + 6);
    ctx.lineTo(SIZE / 2 + 0.5, SIZE);
    ctx.moveTo(0, SIZE / 2 + 0.5);
    ctx.lineTo(SIZE / 2 - 6, SIZE / 2 + 0.5);
    ctx.moveTo(SIZE / 2 + 6, SIZE / 2 + 0.5);
    ctx.lineTo(SIZE, SIZE / 2 + 0.5);
    ctx.stroke();
    if (mark) {
      const mx = SIZE / 2 + (mark[0] - at[0]) * magnification;
      const my = SIZE / 2 + (mark[1] - at[1]) * magnification;
      ctx.strokeStyle = snapped ? '#c2410c' : '#111827';
      ctx.lineWidth = 1.5;
      ctx.beginPath();
      if (snapped) ctx.rect(mx - 5, my - 5, 10, 10);
      else ctx.arc(mx, my, 4, 0, 2 * Math.PI);
      ctx.stroke();
    }
    ctx.strokeStyle = '#374151';
    ctx.lineWidth = 2;
    ctx.strokeRect(1, 1, SIZE - 2, SIZE - 2);
    // Keep the magnifier clear of the pointer: above and to the right, flipping at the edges.
    const [w, h] = this.canvas.size;
    let left = screen[0] + 28;
    let top = screen[1] - SIZE - 28;
    if (left + SIZE > w) left = screen[0] - SIZE - 28;
    if (top < 0) top = screen[1] + 28;
    if (top + SIZE > h) top = Math.max(0, h - SIZE);
    this.el.style.left = `${left}px`;
    this.el.style.top = `${top}px`;
    if (!this.visible) {
      this.visible = true;
      this.el.style.display = 'block';
    }
    void this.host;
  }
}
