import { describe, expect, it } from 'vitest';
import { operatorCodesFrom, readOperatorList, multiply, type Matrix } from '../../src/digitize/operatorPaths.ts';

/** pdf.js's operator codes (pdfjs-dist 5, OPS table). */
const OPS = {
  beginAnnotation: 80, endAnnotation: 81, setLineWidth: 2, setDash: 6, setGState: 9, save: 10, restore: 11, transform: 12, clip: 29, eoClip: 30,
  setStrokeRGBColor: 58, setFillRGBColor: 59, paintFormXObjectBegin: 74, paintFormXObjectEnd: 75,
  paintImageXObject: 85, constructPath: 91, setStrokeTransparent: 92, setFillTransparent: 93,
  stroke: 20, closeStroke: 21, fill: 22, eoFill: 23, fillStroke: 24, eoFillStroke: 25, closeFillStroke: 26, closeEOFillStroke: 27, endPath: 28,
};
const codes = operatorCodesFrom(OPS);
const FLIP: Matrix = [1, 0, 0, -1, 0, 100]; // a 100 × 100 page, y flipped

function list(...ops: [number, unknown[] | null][]) {
  return { fnArray: ops.map((o) => o[0]), argsArray: ops.map((o) => o[1]) };
}
const path = (paint: number, data: number[]) => [OPS.constructPath, [paint, [new Float32Array(data)], null]] as [number, unknown[]];

describe('reading paths out of an operator list', () => {
  it('applies form XObject matrices and restores the state after them', () => {
    const content = readOperatorList(
      list(
        [OPS.paintFormXObjectBegin, [[2, 0, 0, 2, 10, 10], null]],
        [OPS.setStrokeRGBColor, ['#00FF00']],
        path(OPS.stroke, [0, 0, 0, 1, 5, 0]),
        [OPS.paintFormXObjectEnd, null],
        path(OPS.stroke, [0, 0, 0, 1, 5, 0]),
      ),
      codes,
      FLIP,
      100,
      100,
    );
    const [inForm, after] = content.paths;
    expect(inForm!.stroke).toBe('#00ff00');
    expect(inForm!.segments[1]).toEqual({ kind: 'line', to: [20, 90] });
    expect(inForm!.lineWidth).toBeCloseTo(2, 12);
    expect(after!.stroke).toBe('#000000');
    expect(after!.segments[1]).toEqual({ kind: 'line', to: [5, 100] });
  });

  it('turns quadratic segments into the equivalent cubic and keeps closes', () => {
    const content = readOperatorList(list(path(OPS.closeStroke, [0, 0, 0, 3, 30, 30, 60, 0, 4])), codes, [1, 0, 0, 1, 0, 0], 100, 100);
    const segs = content.paths[0]!.segments;
    // Degree elevation of (0,0)–(30,30)–(60,0): control points at 2/3 of the way to (30,30).
    expect(segs[1]).toEqual({ kind: 'cubic', c1: [20, 20], c2: [40, 20], to: [60, 0] });
    expect(segs[2]).toEqual({ kind: 'close' });
  });

  it('takes line width and dash from a graphics-state dictionary, and skips unpainted paths', () => {
    const content = readOperatorList(
      list(
        [OPS.setGState, [[['LW', 3], ['D', [[2, 1], 0]]]]],
        path(OPS.endPath, [0, 0, 0, 1, 1, 1]),
        [OPS.transform, [0.5, 0, 0, 0.5, 0, 0]],
        path(OPS.stroke, [0, 0, 0, 1, 1, 1]),
        [OPS.setStrokeTransparent, []],
        path(OPS.fill, [0, 0, 0, 1, 1, 1, 1, 0, 1, 4]),
      ),
      codes,
      [1, 0, 0, 1, 0, 0],
      100,
      100,
    );
    expect(content.paths).toHaveLength(2);
    expect(content.paths[0]!.lineWidth).toBeCloseTo(1.5, 12);
    expect(content.paths[0]!.dashed).toBe(true);
    expect(content.paths[1]!.stroke).toBeNull();
    expect(content.paths[1]!.fill).toBe('#000000');
  });

  it('measures how much of the page pictures cover', () => {
    const content = readOperatorList(
      list([OPS.save, null], [OPS.transform, [80, 0, 0, 90, 10, 5]], [OPS.paintImageXObject, ['img', 10, 10]], [OPS.restore, null]),
      codes,
      FLIP,
      100,
      100,
    );
    expect(content.images).toBe(1);
    expect(content.imageCoverage).toBeCloseTo(0.72, 12); // 80 × 90 of 100 × 100
  });

  it('records the clipping rectangle in force and drops it on restore', () => {
    const content = readOperatorList(
      list([OPS.save, null], [OPS.clip, null], path(OPS.endPath, [0, 10, 10, 1, 50, 10, 1, 50, 40, 1, 10, 40, 4]), path(OPS.stroke, [0, 0, 0, 1, 99, 99]), [OPS.restore, null], path(OPS.stroke, [0, 0, 0, 1, 99, 99])),
      codes,
      [1, 0, 0, 1, 0, 0],
      100,
      100,
    );
    expect(content.paths[0]!.clip).toEqual([10, 10, 50, 40]);
    expect(content.paths[1]!.clip).toBeUndefined();
  });

  it('leaves out what annotations draw', () => {
    const content = readOperatorList(
      list([OPS.beginAnnotation, ['a1', [0, 0, 10, 10], [1, 0, 0, 1, 0, 0], [1, 0, 0, 1, 0, 0], false]], path(OPS.stroke, [0, 0, 0, 1, 5, 5]), [OPS.endAnnotation, null], path(OPS.stroke, [0, 1, 1, 1, 2, 2])),
      codes,
      [1, 0, 0, 1, 0, 0],
      100,
      100,
    );
    expect(content.paths).toHaveLength(1);
    expect(content.paths[0]!.segments[0]).toEqual({ kind: 'move', to: [1, 1] });
  });

  it('composes matrices so that the inner one applies first', () => {
    const m = multiply([1, 0, 0, 1, 5, 0], [2, 0, 0, 2, 0, 0]);
    expect(m).toEqual([2, 0, 0, 2, 5, 0]);
  });
});
