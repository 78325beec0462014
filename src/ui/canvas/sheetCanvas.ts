/**
 * The sheet on screen: a Konva stage with three layers — the page as drawn by the worker,
 * a sharper drawing of the visible region when zoomed in, and the overlay (panels, anchors,
 * traces, fits, the tool's preview). Zoom and pan by wheel, pinch, drag and keys.
 * Pointer events are turned into sheet coordinates and handed to the active tool.
 */
import Konva from 'konva/lib/Core';
import { Image as KonvaImage } from 'konva/lib/shapes/Image';
import type { SheetWorkerClient } from '../worker/client.ts';
import { fitRect, panBy, toSheetFromScreen, visibleRect, zoomAt, type View } from './view.ts';

export interface CanvasPointer {
  /** Position in sheet units. */
  sheet: [number, number];
  /** Position in CSS pixels within the canvas. */
  screen: [number, number];
  button: number;
  shift: boolean;
  alt: boolean;
  ctrl: boolean;
}

export interface CanvasInput {
  down(p: CanvasPointer): void;
  move(p: CanvasPointer): void;
  up(p: CanvasPointer): void;
  leave(): void;
}

export type OverlayPainter = (ctx: CanvasRenderingContext2D, view: View) => void;

interface PageInfo {
  page: number;
  width: number;
  height: number;
  kind: 'pdf' | 'image';
}

/** Pixels per sheet unit of the whole-page drawing kept for zoomed views and the magnifier. */
function detailScale(info: PageInfo): number {
  if (info.kind === 'image') return 1;
  const budget = 16e6; // pixels: about 64 MB of RGBA
  return Math.min(4, Math.sqrt(budget / (info.width * info.height)));
}

export class SheetCanvas {
  readonly stage: Konva.Stage;
  private readonly pageLayer = new Konva.Layer({ listening: false });
  private readonly sharpLayer = new Konva.Layer({ listening: false });
  private readonly overlayLayer = new Konva.Layer({ listening: false });
  private readonly pageImage = new KonvaImage({ image: undefined, listening: false });
  private readonly sharpImage = new KonvaImage({ image: undefined, listening: false, visible: false });
  private readonly overlayShape: Konva.Shape;
  private info: PageInfo | null = null;
  private view: View = { zoom: 1, offsetX: 0, offsetY: 0 };
  /** The whole page at detail scale: shown on screen and read by the magnifier. */
  detail: { bitmap: ImageBitmap; scale: number } | null = null;
  private sharp: { bitmap: ImageBitmap; scale: number; rect: readonly [number, number, number, number] } | null = null;
  private sharpTimer: number | undefined;
  private sharpSerial = 0;
  private panning: { x: number; y: number } | null = null;
  private spaceDown = false;
  private input: CanvasInput | null = null;
  private readonly viewListeners = new Set<(view: View) => void>();

  constructor(
    private readonly container: HTMLDivElement,
    private readonly worker: SheetWorkerClient,
    painter: OverlayPainter,
  ) {
    this.stage = new Konva.Stage({ container, width: container.clientWidth || 800, height: container.clientHeight || 600 });
    this.pageLayer.add(this.pageImage);
    this.sharpLayer.add(this.sharpImage);
    this.overlayShape = new Konva.Shape({
      listening: false,
      sceneFunc: (context) => {
        const ctx = (context as unknown as { _context: CanvasRenderingContext2D })._context;
        ctx.save();
        painter(ctx, this.view);
        ctx.restore();
      },
    });
    this.overlayLayer.add(this.overlayShape);
    this.stage.add(this.pageLayer, this.sharpLayer, this.overlayLayer);
    this.bindEvents();
    new ResizeObserver(() => this.resize()).observe(container);
  }

  setInput(input: CanvasInput): void {
    this.input = input;
  }

  onView(listener: (view: View) => void): () => void {
    this.viewListeners.add(listener);
    return () => this.viewListeners.delete(listener);
  }

  get currentView(): View {
    return this.view;
  }

  get page(): PageInfo | null {
    return this.info;
  }

  get size(): [number, number] {
    return [this.stage.width(), this.stage.height()];
  }

  /** Shows a page: draws it once at detail scale in the worker, then fits it to the window. */
  async showPage(info: PageInfo, onProgress?: (label: string, fraction: number | null) => void): Promise<void> {
    this.info = info;
    this.sharp = null;
    this.sharpImage.visible(false);
    const scale = detailScale(info);
    onProgress?.(`Drawing page ${info.page}`, null);
    const { bitmap } = await this.worker.call('render', { page: info.page, scale, rect: [0, 0, info.width, info.height] }, (p) => onProgress?.(p.label, p.fraction));
    if (this.info !== info) {
      bitmap.close();
      return;
    }
    this.detail?.bitmap.close();
    this.detail = { bitmap, scale };
    this.pageImage.image(bitmap);
    this.fitPage();
  }

  clear(): void {
    this.info = null;
    this.detail?.bitmap.close();
    this.detail = null;
    this.sharp = null;
    this.pageImage.image(undefined);
    this.sharpImage.visible(false);
    this.stage.batchDraw();
  }

  fitPage(): void {
    if (!this.info) return;
    const [w, h] = this.size;
    this.setView(fitRect([0, 0, this.info.width, this.info.height], w, h, 12));
    this.fitted = true;
  }

  /** Brings a sheet rectangle [x, y, w, h] into view. */
  showRect(rect: readonly [number, number, number, number], margin = 40): void {
    const [w, h] = this.size;
    this.setView(fitRect(rect, w, h, margin));
  }

  zoomBy(factor: number, at?: readonly [number, number]): void {
    const [w, h] = this.size;
    this.setView(zoomAt(this.view, factor, at ?? [w / 2, h / 2]));
  }

  panBy(dx: number, dy: number): void {
    this.setView(panBy(this.view, dx, dy));
  }

  setView(view: View): void {
    this.fitted = false;
    this.view = view;
    this.layout();
    for (const l of this.viewListeners) l(view);
    this.scheduleSharp();
  }

  /** Redraws the overlay only (after an edit or a pointer move). */
  redrawOverlay(): void {
    this.overlayLayer.batchDraw();
  }

  private layout(): void {
    const info = this.info;
    if (!info) {
      this.stage.batchDraw();
      return;
    }
    const { zoom, offsetX, offsetY } = this.view;
    this.pageImage.position({ x: offsetX, y: offsetY });
    this.pageImage.size({ width: info.width * zoom, height: info.height * zoom });
    // Past one screen pixel per drawn pixel, smoothing only blurs: show pixels as they are.
    const perPixel = zoom * (window.devicePixelRatio || 1);
    this.pageLayer.imageSmoothingEnabled(!this.detail || perPixel < this.detail.scale * 1.5);
    if (this.sharp) {
      const [x, y, w, h] = this.sharp.rect;
      const fits = Math.abs(this.sharp.scale - perPixel) / perPixel < 0.01;
      this.sharpImage.visible(fits);
      if (fits) {
        this.sharpImage.position({ x: offsetX + x * zoom, y: offsetY + y * zoom });
        this.sharpImage.size({ width: w * zoom, height: h * zoom });
      }
    }
    this.stage.batchDraw();
  }

  /** When zoomed beyond the detail drawing, asks the worker for a sharp drawing of what is visible. */
  private scheduleSharp(): void {
    window.clearTimeout(this.sharpTimer);
    const info = this.info;
    if (!info || info.kind !== 'pdf' || !this.detail) return;
    const perPixel = this.view.zoom * (window.devicePixelRatio || 1);
    if (perPixel <= this.detail.scale * 1.05) {
      this.sharpImage.visible(false);
      return;
    }
    this.sharpTimer = window.setTimeout(async () => {
      const [w, h] = this.size;
      const rect = visibleRect(this.view, w, h, info.width, info.height);
      if (!rect) return;
      const serial = ++this.sharpSerial;
      try {
        const result = await this.worker.call('render', { page: info.page, scale: perPixel, rect });
        if (serial !== this.sharpSerial || this.info !== info) {
          result.bitmap.close();
          return;
        }
        this.sharp?.bitmap.close();
        this.sharp = { bitmap: result.bitmap, scale: perPixel, rect };
        this.sharpImage.image(result.bitmap);
        this.layout();
      } catch {
        // A failed sharp drawing leaves the detail drawing in place; nothing is lost.
      }
    }, 120);
  }

  /** True while the view is the fitted page, so that a resize fits it again. */
  private fitted = false;

  private resize(): void {
    const w = this.container.clientWidth;
    const h = this.container.clientHeight;
    if (w === 0 || h === 0) return;
    const oldW = this.stage.width();
    const oldH = this.stage.height();
    if (oldW === w && oldH === h) return;
    this.stage.size({ width: w, height: h });
    if (this.fitted) {
      this.fitPage();
      return;
    }
    // Keep what was in the middle of the view in the middle.
    const centre = toSheetFromScreen(this.view, [oldW / 2, oldH / 2]);
    const { zoom } = this.view;
    this.view = { zoom, offsetX: w / 2 - centre[0] * zoom, offsetY: h / 2 - centre[1] * zoom };
    this.layout();
    for (const l of this.viewListeners) l(this.view);
    this.scheduleSharp();
  }

  private pointer(event: PointerEvent | MouseEvent): CanvasPointer {
    const box = this.container.getBoundingClientRect();
    const screen: [number, number] = [event.clientX - box.left, event.clientY - box.top];
    return { sheet: toSheetFromScreen(this.view, screen), screen, button: event.button, shift: event.shiftKey, alt: event.altKey, ctrl: event.ctrlKey || event.metaKey };
  }

  private bindEvents(): void {
    const el = this.container;
    el.addEventListener('wheel', (event) => {
      event.preventDefault();
      const p = this.pointer(event);
      if (event.ctrlKey || event.metaKey || Math.abs(event.deltaX) < 1e-6) {
        // Wheel, or pinch on a trackpad (sent as wheel with ctrlKey): zoom about the cursor.
        const lines = event.deltaMode === 1 ? 30 : event.deltaMode === 2 ? 300 : 1;
        const factor = Math.exp((-event.deltaY * lines) / (event.ctrlKey ? 100 : 500));
        this.setView(zoomAt(this.view, factor, p.screen));
      } else {
        // Two-finger scroll on a trackpad: pan.
        this.setView(panBy(this.view, -event.deltaX, -event.deltaY));
      }
    }, { passive: false });
    el.addEventListener('pointerdown', (event) => {
      el.focus({ preventScroll: true });
      if (event.button === 1 || event.button === 2 || this.spaceDown) {
        this.panning = { x: event.clientX, y: event.clientY };
        el.setPointerCapture(event.pointerId);
        el.classList.add('panning');
        event.preventDefault();
        return;
      }
      if (event.button !== 0) return;
      el.setPointerCapture(event.pointerId);
      this.input?.down(this.pointer(event));
    });
    el.addEventListener('pointermove', (event) => {
      if (this.panning) {
        this.setView(panBy(this.view, event.clientX - this.panning.x, event.clientY - this.panning.y));
        this.panning = { x: event.clientX, y: event.clientY };
        return;
      }
      this.input?.move(this.pointer(event));
    });
    el.addEventListener('pointerup', (event) => {
      if (this.panning) {
        this.panning = null;
        el.classList.remove('panning');
        return;
      }
      if (event.button !== 0) return;
      this.input?.up(this.pointer(event));
    });
    el.addEventListener('pointerleave', () => {
      if (!this.panning) this.input?.leave();
    });
    el.addEventListener('contextmenu', (event) => event.preventDefault());
    el.addEventListener('keydown', (event) => {
      if (event.key === ' ') {
        this.spaceDown = true;
        el.classList.add('pan-ready');
        event.preventDefault();
      }
    });
    el.addEventListener('keyup', (event) => {
      if (event.key === ' ') {
        this.spaceDown = false;
        el.classList.remove('pan-ready');
      }
    });
  }
}
