/** Choosing, among the panel calibrations read from the text layer, the one that belongs to a drawn frame. */
import { frameOverlap as overlap, type Frame } from '../store/draft.ts';
import type { AnchorProposal } from '../worker/protocol.ts';

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
