/**
 * Flow deflection θ (radians) produced by an oblique shock at angle β (radians, measured from
 * the upstream flow direction) in a stream of Mach `mach`: the θ-β-M relation
 * tan θ = 2 cot β (M² sin²β − 1) / (M² (γ + cos 2β) + 2).
 *
 * Sign: θ > 0 is a compression (the flow turns toward the shock). Edge cases: β = μ (the Mach
 * angle) and β = π/2 (a normal shock) both give θ = 0; β below μ gives a negative number that
 * is not a physical shock.
 *
 * Source: NACA Report 1135, oblique-shock relations (θ-β-M relation).
 */
export function shockDeflection(mach: number, beta: number, gamma: number): number {
  const m2 = mach * mach;
  const sinB = Math.sin(beta);
  const cosB = Math.cos(beta);
  const num = 2 * (cosB / sinB) * (m2 * sinB * sinB - 1);
  const den = m2 * (gamma + cosB * cosB - sinB * sinB) + 2;
  return Math.atan(num / den);
}
