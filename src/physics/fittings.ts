/**
 * Loss coefficients K of common fittings, fully turbulent flow, for h = K·v²/(2g).
 * FROM MEMORY: typical textbook values (Crane TP-410-style tables give size-dependent values);
 * they vary by make and size, so a K given by the engineer always overrides them.
 */
import { PhysicsInputError } from './errors.ts';

export const FITTING_K: Readonly<Record<string, { k: number; words: string }>> = {
  'entrance-sharp': { k: 0.5, words: 'sharp-edged entrance' },
  'entrance-projecting': { k: 0.9, words: 'inward-projecting (re-entrant) entrance' },
  'entrance-rounded': { k: 0.04, words: 'well-rounded entrance' },
  exit: { k: 1.0, words: 'pipe exit into a tank' },
  'gate-valve': { k: 0.17, words: 'gate valve, fully open' },
  'globe-valve': { k: 8, words: 'globe valve, fully open' },
  'check-valve-swing': { k: 2, words: 'swing check valve' },
  'elbow-90': { k: 0.6, words: '90° standard elbow' },
  'elbow-90-long': { k: 0.25, words: '90° long-radius elbow' },
  'elbow-45': { k: 0.3, words: '45° elbow' },
  'tee-through': { k: 0.4, words: 'tee, flow through the run' },
  'tee-branch': { k: 1.2, words: 'tee, flow through the branch' },
  'butterfly-valve': { k: 0.5, words: 'butterfly valve, fully open' },
  strainer: { k: 1.5, words: 'basket strainer, clean' },
};

/** Source note shown beside results that used the table. */
export const FITTING_TABLE_SOURCE = 'fitting K values from a table of typical values (from memory); give K directly to override';

/** K of a named fitting (times count). Throws PhysicsInputError naming the known fittings for an unknown name. */
export function fittingK(name: string, count = 1): number {
  const entry = FITTING_K[name];
  if (!entry) throw new PhysicsInputError(`Unknown fitting "${name}"; use one of ${Object.keys(FITTING_K).join(', ')}, or give its K value.`);
  if (!(count >= 0) || !Number.isFinite(count)) throw new PhysicsInputError(`The number of "${name}" fittings must be zero or more.`);
  return entry.k * count;
}
