/** Thrown when a physical property is asked for outside the range its equation covers. */
export class PhysicsInputError extends Error {
  override name = 'PhysicsInputError';
}
