/**
 * Coordinate spaces that must not mix.
 * - SheetPoint: page units with the origin at the top-left corner and y pointing down —
 *   PDF points at scale 1 (1/72 in) for a PDF page, pixels for an image, where the centre
 *   of the first pixel is (0.5, 0.5).
 * - DataPoint: panel values (flow, head, … in the panel's own axis units).
 * - PixelPoint: a position in a rendered raster at some scale (pixels per sheet unit),
 *   same origin convention as SheetPoint.
 */
declare const space: unique symbol;
type InSpace<S extends string> = readonly [number, number] & { readonly [space]: S };

export type SheetPoint = InSpace<'sheet'>;
export type DataPoint = InSpace<'data'>;
export type PixelPoint = InSpace<'pixel'>;

/**
 * A sheet point, or a plain pair read from a file that is known to hold sheet coordinates.
 * A point branded as another space does not fit: `toData(toData(p))` fails to compile.
 */
export type SheetCoordinates = readonly [number, number] & { readonly [space]?: 'sheet' };
/** A data point, or a plain pair known to hold data values; another space's point does not fit. */
export type DataCoordinates = readonly [number, number] & { readonly [space]?: 'data' };

export const sheetPoint = (x: number, y: number) => [x, y] as unknown as SheetPoint;
export const dataPoint = (x: number, y: number) => [x, y] as unknown as DataPoint;
export const pixelPoint = (x: number, y: number) => [x, y] as unknown as PixelPoint;
