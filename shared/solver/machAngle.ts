/**
 * Mach angle μ = asin(1/M), radians: the angle between a Mach wave and the flow direction.
 *
 * Edge cases: M = 1 gives π/2; M → ∞ gives 0. M < 1 (or not a number) has no Mach wave and
 * throws a RangeError (a programmer error: the solver never asks for it).
 *
 * Source: NACA Report 1135 (Mach angle, μ = sin⁻¹(1/M)).
 */
export function machAngle(mach: number): number {
  if (!(mach >= 1)) throw new RangeError(`machAngle needs M ≥ 1, got ${mach}`);
  return Math.asin(1 / mach);
}
