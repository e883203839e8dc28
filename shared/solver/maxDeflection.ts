/** The largest deflection an attached oblique shock can turn a stream through. Radians. */
export interface MaxDeflection {
  /** Maximum deflection θmax. */
  thetaMax: number;
  /** Shock angle at θmax (divides the weak and strong branches). */
  betaAtMax: number;
}

/**
 * Maximum deflection θmax(M, γ) of an attached oblique shock and the shock angle there.
 *
 * Written in u = cot β, the θ-β-M relation reads tan θ = 2u(A − u²)/(B u² + C) with
 * A = M² − 1, B = (γ+1)M² + 2, C = (γ−1)M² + 2; dθ/du = 0 gives the quadratic
 * B u⁴ + (AB + 3C) u² − AC = 0, whose positive root is taken in the cancellation-free form
 * u² = 2AC / ((AB + 3C) + √((AB + 3C)² + 4ABC)). This is the same point as the published
 * sin²β form (tests compare the two).
 *
 * Units: radians. Edge cases: M ≤ 1 returns θmax = 0 and β = π/2 (no attached shock at all);
 * M → ∞ tends to θmax = asin(1/γ) (45.58° for γ = 1.4).
 *
 * Source: NACA Report 1135, oblique-shock relations (condition for maximum deflection).
 */
export function maxDeflection(mach: number, gamma: number): MaxDeflection {
  if (!(mach > 1)) return { thetaMax: 0, betaAtMax: Math.PI / 2 };
  const u = cotBetaAtMaxDeflection(mach, gamma);
  return { thetaMax: maxDeflectionAtCot(mach, gamma, u), betaAtMax: Math.atan2(1, u) };
}

/**
 * θmax (radians) from u = cotBetaAtMaxDeflection(mach, gamma), for a caller that has u already
 * (the trailing-edge matching needs both): tan θmax = 2u(A − u²)/(B u² + C), as in
 * `maxDeflection` (which calls this). M > 1 only.
 *
 * Source: NACA Report 1135, oblique-shock relations (θ-β-M relation at maximum deflection).
 */
export function maxDeflectionAtCot(mach: number, gamma: number, u: number): number {
  const m2 = mach * mach;
  const a = m2 - 1;
  const b = (gamma + 1) * m2 + 2;
  const c = (gamma - 1) * m2 + 2;
  return Math.atan((2 * u * (a - u * u)) / (b * u * u + c));
}

/**
 * cot β at the maximum deflection: the positive root of B u⁴ + (AB + 3C) u² − AC = 0 (see
 * `maxDeflection`), dimensionless. The weak branch lies at larger cot β (smaller β), the strong
 * one at smaller. Edge case: M ≤ 1 returns 0 (β = π/2).
 *
 * Source: NACA Report 1135, oblique-shock relations (condition for maximum deflection).
 */
export function cotBetaAtMaxDeflection(mach: number, gamma: number): number {
  if (!(mach > 1)) return 0;
  const m2 = mach * mach;
  const a = m2 - 1;
  const b = (gamma + 1) * m2 + 2;
  const c = (gamma - 1) * m2 + 2;
  const p = a * b + 3 * c;
  return Math.sqrt((2 * a * c) / (p + Math.sqrt(p * p + 4 * a * b * c)));
}
