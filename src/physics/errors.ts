/** Thrown when a physical property is asked for outside the range its equation covers. */
import { UserError } from '../model/errors.ts';
export class PhysicsInputError extends UserError {
  override name = 'PhysicsInputError';
}
