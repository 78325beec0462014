import { createCanvas, type SKRSContext2D } from '@napi-rs/canvas';
import type { RasterImage } from '../../src/digitize/raster.ts';

// Small pictures drawn here with a 2D canvas; the tracer itself only ever sees the RGBA buffer.
export function picture(width: number, height: number, draw: (ctx: SKRSContext2D) => void, scale = 1): RasterImage {
  const canvas = createCanvas(width, height);
  const ctx = canvas.getContext('2d');
  ctx.fillStyle = '#ffffff';
  ctx.fillRect(0, 0, width, height);
  ctx.lineCap = 'round';
  draw(ctx);
  return { width, height, data: new Uint8ClampedArray(ctx.getImageData(0, 0, width, height).data), scale };
}

export function stroke(ctx: SKRSContext2D, f: (x: number) => number, x0: number, x1: number, colour: string, width: number): void {
  ctx.strokeStyle = colour;
  ctx.lineWidth = width;
  ctx.beginPath();
  for (let x = x0; x <= x1; x += 1) (x === x0 ? ctx.moveTo(x, f(x)) : ctx.lineTo(x, f(x)));
  ctx.stroke();
}
