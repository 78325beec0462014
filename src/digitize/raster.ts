/**
 * A rendered or decoded raster in memory: RGBA, row-major, 4 bytes a pixel.
 * `scale` is pixels per sheet unit, so that pixel ↔ sheet is a plain multiply:
 *   sheet = pixel / scale   (both with the top-left origin, y down).
 * For an image sheet the sheet unit is the image pixel, so scale = 1.
 */
import { pixelPoint, sheetPoint, type PixelPoint, type SheetPoint } from './points.ts';

export interface RasterImage {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8ClampedArray;
  readonly scale: number;
}

export function toPixel(image: Pick<RasterImage, 'scale'>, p: SheetPoint): PixelPoint {
  return pixelPoint(p[0] * image.scale, p[1] * image.scale);
}

export function toSheet(image: Pick<RasterImage, 'scale'>, p: PixelPoint): SheetPoint {
  return sheetPoint(p[0] / image.scale, p[1] / image.scale);
}
