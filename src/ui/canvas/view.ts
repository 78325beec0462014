/**
 * The view onto the sheet: how many screen pixels one sheet unit takes (zoom) and where
 * the sheet's origin lies on screen. screen = sheet · zoom + offset, and back.
 */
export interface View {
  readonly zoom: number;
  readonly offsetX: number;
  readonly offsetY: number;
}

export const MIN_ZOOM = 0.05;
export const MAX_ZOOM = 64;

export function toScreen(view: View, p: readonly [number, number]): [number, number] {
  return [p[0] * view.zoom + view.offsetX, p[1] * view.zoom + view.offsetY];
}

export function toSheetFromScreen(view: View, s: readonly [number, number]): [number, number] {
  return [(s[0] - view.offsetX) / view.zoom, (s[1] - view.offsetY) / view.zoom];
}

function clampZoom(z: number): number {
  return Math.min(MAX_ZOOM, Math.max(MIN_ZOOM, z));
}

/** Zooms by `factor` keeping the sheet point under the screen point `at` in place. */
export function zoomAt(view: View, factor: number, at: readonly [number, number]): View {
  const zoom = clampZoom(view.zoom * factor);
  const k = zoom / view.zoom;
  return { zoom, offsetX: at[0] - (at[0] - view.offsetX) * k, offsetY: at[1] - (at[1] - view.offsetY) * k };
}

export function panBy(view: View, dx: number, dy: number): View {
  return { ...view, offsetX: view.offsetX + dx, offsetY: view.offsetY + dy };
}

/** The view that shows the whole rectangle [x, y, w, h] centred in a screen area, with a margin in pixels. */
export function fitRect(rect: readonly [number, number, number, number], screenWidth: number, screenHeight: number, margin = 16): View {
  const [x, y, w, h] = rect;
  const zoom = clampZoom(Math.min((screenWidth - 2 * margin) / Math.max(w, 1e-9), (screenHeight - 2 * margin) / Math.max(h, 1e-9)));
  return { zoom, offsetX: (screenWidth - w * zoom) / 2 - x * zoom, offsetY: (screenHeight - h * zoom) / 2 - y * zoom };
}

/** The part of the sheet [x, y, w, h] visible on a screen area, clipped to the sheet. */
export function visibleRect(view: View, screenWidth: number, screenHeight: number, sheetWidth: number, sheetHeight: number): [number, number, number, number] | null {
  const [x0, y0] = toSheetFromScreen(view, [0, 0]);
  const [x1, y1] = toSheetFromScreen(view, [screenWidth, screenHeight]);
  const left = Math.max(0, x0);
  const top = Math.max(0, y0);
  const right = Math.min(sheetWidth, x1);
  const bottom = Math.min(sheetHeight, y1);
  if (right <= left || bottom <= top) return null;
  return [left, top, right - left, bottom - top];
}
