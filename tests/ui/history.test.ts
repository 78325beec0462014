import { describe, expect, it } from 'vitest';
import { commit, redo, replacePresent, startHistory, undo } from '../../src/ui/store/history.ts';

describe('undo history', () => {
  it('undo returns the previous state and redo brings the undone one back', () => {
    let h = startHistory(1);
    h = commit(h, 2, 'two');
    h = commit(h, 3, 'three');
    h = undo(h);
    expect(h.present).toBe(2);
    expect(h.futureLabels).toEqual(['three']);
    h = redo(h);
    expect(h.present).toBe(3);
    expect(h.labels).toEqual(['two', 'three']);
  });

  it('a new edit after an undo forgets the undone future', () => {
    let h = commit(commit(startHistory('a'), 'b', 'b'), 'c', 'c');
    h = commit(undo(h), 'd', 'd');
    expect(h.future).toEqual([]);
    expect(redo(h)).toBe(h);
    expect(h.past).toEqual(['a', 'b']);
  });

  it('undo and redo at the ends of the history change nothing', () => {
    const h = startHistory(0);
    expect(undo(h)).toBe(h);
    expect(redo(h)).toBe(h);
  });

  it('keeps at most the given number of steps, dropping the oldest', () => {
    let h = startHistory(0);
    for (let i = 1; i <= 10; i++) h = commit(h, i, `step ${i}`, 4);
    expect(h.past).toEqual([6, 7, 8, 9]);
    expect(h.labels).toEqual(['step 7', 'step 8', 'step 9', 'step 10']);
  });

  it('replacing the present adds no undo step', () => {
    const h = replacePresent(commit(startHistory(1), 2, 'two'), 5);
    expect(h.present).toBe(5);
    expect(undo(h).present).toBe(1);
  });
});
