/**
 * An image as a Sheet of kind 'image' (sheet units are the image's pixels). The Node and
 * browser loaders differ only in how they decode and resample; both hand those in here.
 */
import type { RasterImage } from '../raster.ts';
import { SheetError, type Sheet } from '../sheet.ts';

export function imageSheet(image: RasterImage, sha256: string, resample: (scale: number) => Promise<RasterImage> | RasterImage): Sheet {
  return {
    kind: 'image',
    width: image.width,
    height: image.height,
    sha256,
    page: 1,
    render: async (scale: number) => {
      if (!(scale > 0) || !Number.isFinite(scale)) throw new SheetError(`The render scale ${scale} is not a positive number; use 1 for an image at its own resolution.`);
      return scale === 1 ? image : resample(scale);
    },
    paths: async () => [],
    text: async () => [],
    close: async () => undefined,
  };
}

/**
 * The sheet of a page reduced on load: its units stay the file's pixels (`header` size), and
 * `render(1)` (or more) answers with the working raster itself (its `scale` below 1); other
 * scales are resampled from it.
 */
export function reducedImageSheet(sheet: Sheet, header: { width: number; height: number }, image: RasterImage, resample: (scale: number) => Promise<RasterImage> | RasterImage): Sheet {
  return {
    ...sheet,
    width: header.width,
    height: header.height,
    render: async (scale: number) => {
      if (!(scale > 0) || !Number.isFinite(scale)) throw new SheetError(`The render scale ${scale} is not a positive number; use 1 for an image at its own resolution.`);
      return scale >= 1 || Math.abs(scale - image.scale) < 1e-12 ? image : resample(scale);
    },
  };
}
