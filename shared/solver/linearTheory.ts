/**
 * Ackeret (linear, first-order) pressure coefficient on a surface deflected by `theta`
 * (radians from the free stream, + = compression) in a stream of Mach `mach`:
 * Cp = 2θ / √(M² − 1).
 *
 * Edge cases: θ = 0 gives 0; M → 1⁺ makes it grow without bound (the theory fails at M = 1; the
 * solver only calls it for M > 1, where it stays finite). It is applied to the facet's deflection
 * as an angle, not its tangent.
 *
 * Source: Ackeret's supersonic thin-airfoil theory (e.g. NACA Report 1135, linearized
 * supersonic flow; Anderson, "Modern Compressible Flow", linearized supersonic flow, from memory).
 */
export function linearTheoryCp(theta: number, mach: number): number {
  return (2 * theta) / Math.sqrt((mach - 1) * (mach + 1));
}
