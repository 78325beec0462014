/** Choosing, among the panel calibrations read from the text layer, the one that belongs to a drawn frame. */
import type { Frame } from '../store/draft.ts';
import type { AnchorProposal } from '../worker/protocol.ts';

function overlap(a: readonly number[], b: readonly number[]): number {
  const w = Math.max(0, Math.min(a[2] as number, b[2] as number) - Math.max(a[0] as number, b[0] as number));
  const h = Math.max(0, Math.min(a[3] as number, b[3] as number) - Math.max(a[1] as number, b[1] as number));
  const area = (r: readonly number[]) => Math.max(0, (r[2] as number) - (r[0] as number)) * Math.max(0, (r[3] as number) - (r[1] as number));
  const inter = w * h;
  const union = area(a) + area(b) - inter;
  return union > 0 ? inter / union : 0;
}

/**
 * The proposal whose labelled range best covers the frame (at least 40 % overlap); between
 * value axes on both sides of one panel, the one whose labels sit nearer the frame's left edge.
 */
export function bestProposal(all: readonly AnchorProposal[], frame: Frame): AnchorProposal | null {
  let best: { p: AnchorProposal; score: number } | null = null;
  for (const p of all) {
    const o = overlap(p.frame, frame);
    if (o < 0.4) continue;
    const yAnchor = p.anchors.find((a) => a.y !== undefined);
    const leftness = yAnchor ? Math.abs(yAnchor.at[0] - frame[0]) / Math.max(1e-9, frame[2] - frame[0]) : 1;
    const score = o - 0.2 * leftness;
    if (!best || score > best.score) best = { p, score };
  }
  return best?.p ?? null;
}
