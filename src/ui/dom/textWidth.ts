/**
 * Width of a line of text as the browser draws it, px: measured with a canvas 2D context in the
 * given CSS font, so that labels placed side by side by their widths do not run into each other
 * (a fixed width a character underestimates wide letters such as "m"). Without a canvas (no
 * DOM), an estimate of 0.62 em a character, wide enough for digits and most letters.
 */
let context: CanvasRenderingContext2D | null | undefined;

export function textWidth(text: string, font: string, sizePx: number): number {
  if (context === undefined) context = typeof document === 'undefined' ? null : document.createElement('canvas').getContext('2d');
  if (!context) return text.length * 0.62 * sizePx;
  context.font = font;
  return context.measureText(text).width;
}
