/** Tracks drawn from a formula, for the tests of the line finder's rules (src/digitize/detect/rasterLines.ts). */
import type { Track } from '../../src/digitize/detect/rasterLines.ts';

/** A track of the rows `v(u)` over columns a … b (level pixels), `width` px wide, with 20 px of room. */
export function rowsTrack(a: number, b: number, v: (u: number) => number, width = 3): Track {
  const t: Track = { u: [], v: [], room: [], len: [] };
  for (let u = a; u <= b; u++) {
    t.u.push(u);
    t.v.push(v(u));
    t.room.push(20);
    t.len.push(width);
  }
  return t;
}
