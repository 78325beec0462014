/**
 * An edit of the draft: a pure function from one draft to the next. It returns the next
 * draft with a label for the undo list, or null when nothing would change. Bad input
 * throws EditError with a sentence for the status line; the draft is then left as it was.
 */
import { UserError } from '../../../model/errors.ts';
import type { Draft } from '../draft.ts';

export interface ActionResult {
  readonly draft: Draft;
  /** Short description for "Undo …" and "Redo …". */
  readonly label: string;
  /** False for changes that are not edits (such as recording the file's checksum). */
  readonly undoable: boolean;
}

export type Action = (draft: Draft) => ActionResult | null;

export class EditError extends UserError {
  override name = 'EditError';
}

export function edited(draft: Draft, label: string): ActionResult {
  return { draft, label, undoable: true };
}

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
