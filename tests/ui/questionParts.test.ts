import { describe, expect, it } from 'vitest';
import { questionParts } from '../../src/ui/views/detectBox.ts';

describe('a question of the automatic take-off shown as a list', () => {
  it('splits "(1) … (2) …" into its lead and its items', () => {
    const text = 'Some curves need you: (1) 5 lines never stand alone; trace them by hand. (2) A power curve ending at 113.3 m3/h (nearest: the 345 head curve) is left out. (3) Look at "head-377".';
    expect(questionParts(text)).toEqual({
      lead: 'Some curves need you:',
      items: ['5 lines never stand alone; trace them by hand.', 'A power curve ending at 113.3 m3/h (nearest: the 345 head curve) is left out.', 'Look at "head-377".'],
    });
  });

  it('keeps a question without numbered parts, or with a lone "(1)", whole', () => {
    expect(questionParts('Give the diameters drawn.')).toEqual({ lead: 'Give the diameters drawn.', items: [] });
    expect(questionParts('Only (1) here.')).toEqual({ lead: 'Only (1) here.', items: [] });
  });

  it('stops at a break in the numbering: a "(4)" after "(2)" stays inside the second item', () => {
    expect(questionParts('Lead: (1) one. (2) two (4) four.').items).toEqual(['one.', 'two (4) four.']);
  });
});
