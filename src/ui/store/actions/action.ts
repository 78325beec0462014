/**
 * An edit of the draft: a pure function from one draft to the next. It returns the next
 * draft with a label for the undo list, or null when nothing would change. Bad input
 * throws EditError with a sentence for the status line; the draft is then left as it was.
 */
import { UserError } from '../../../model/errors.ts';
import { readDecimal, type ReadDecimalOptions } from '../../../units/readNumber.ts';
import type { Draft } from '../draft.ts';

export interface ActionResult {
  readonly draft: Draft;
  /** Short description for "Undo …" and "Redo …". */
  readonly label: string;
  /** False for changes that are not edits (such as recording the file's checksum). */
  readonly undoable: boolean;
  /** True for the edit that puts found parts in: it does not make them the engineer's (see detected.ts). */
  readonly keepsOrigin?: boolean;
}

export type Action = (draft: Draft) => ActionResult | null;

export class EditError extends UserError {
  override name = 'EditError';
}

export function edited(draft: Draft, label: string): ActionResult {
  return { draft, label, undoable: true };
}

/**
 * The action for a number typed into a field, read by the one reader (src/units/readNumber.ts):
 * a text that is not a decimal number (or of the wrong sign) is refused with its sentence, and
 * the draft stays as it was.
 */
export const typedNumber = (text: string, field: string, make: (value: number) => Action, options?: ReadDecimalOptions): Action => (draft) =>
  make(readDecimal(text, field, options))(draft);

export function requireFinite(value: number, what: string): number {
  if (!Number.isFinite(value)) throw new EditError(`${what} must be a number; type digits such as 120 or 1.5e3.`);
  return value;
}

export function requirePositive(value: number, what: string): number {
  requireFinite(value, what);
  if (!(value > 0)) throw new EditError(`${what} must be greater than zero.`);
  return value;
}

/** Replaces the one element of a list whose id matches, or throws when none does. */
export function replaceById<T extends { id: string }>(list: readonly T[], id: string, change: (item: T) => T, what: string): T[] {
  let found = false;
  const next = list.map((item) => {
    if (item.id !== id) return item;
    found = true;
    return change(item);
  });
  if (!found) throw new EditError(`There is no ${what} "${id}"; it may have been removed.`);
  return next;
}
