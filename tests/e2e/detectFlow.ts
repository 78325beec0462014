/**
 * What the detection browser tests read from the workbench: the draft's found parts, and the
 * status line once it says what is awaited.
 */
import type { User } from './harness.ts';

export type Part = { id: string; origin?: string; confidence?: number; diameter?: number; quantity?: string };

/** The draft's panels and traces as found (or set), and the detector's open questions (null before any detection). */
export async function draftParts(user: User): Promise<{ panels: Part[]; traces: Part[]; questions: string[] | null }> {
  return user.page.evaluate(() => {
    const d = (window as unknown as { pumpscribe: () => { store: { draft: { panels: Part[]; traces: Part[]; detected?: { questions: string[] } } } } }).pumpscribe().store.draft;
    const pick = (p: Part) => ({ id: p.id, origin: p.origin, confidence: p.confidence, diameter: p.diameter, quantity: p.quantity });
    return { panels: d.panels.map(pick), traces: d.traces.map(pick), questions: d.detected ? [...d.detected.questions] : null };
  });
}

/** Waits until the status line matches `pattern`, and returns it. */
export async function waitMessage(user: User, pattern: RegExp, timeout = 120_000): Promise<string> {
  await user.page.waitForFunction((src) => new RegExp(src).test(document.querySelector('#message')?.textContent ?? ''), pattern.source, { timeout, polling: 100 });
  return (await user.page.textContent('#message')) ?? '';
}
