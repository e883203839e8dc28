import { shockDeflection } from './shockDeflection';

/** The oblique shock behind which the flow is exactly sonic (M2 = 1). Radians. */
export interface SonicDeflection {
  /** Deflection at which M2 = 1 on the weak branch; slightly below θmax. */
  thetaSonic: number;
  /** Shock angle there. */
  betaSonic: number;
}

/**
 * Sonic point of the weak oblique-shock branch: the deflection θ* (radians) above which the
 * flow behind the shock is subsonic, from the closed form
 * sin²β* = [ (γ+1)M²/4 − (3−γ)/4 + √((γ+1)((γ+1)M⁴/16 − (3−γ)M²/8 + (γ+9)/16)) ] / (γ M²).
 *
 * Between θ* and θmax the shock is attached but the surface flow behind it is subsonic: the
 * march reports that as `subsonic`. Edge case: M ≤ 1 returns θ* = 0, β* = π/2.
 *
 * Source: NACA Report 1135, oblique-shock relations (condition for sonic flow behind the shock).
 */
export function sonicDeflection(mach: number, gamma: number): SonicDeflection {
  if (!(mach > 1)) return { thetaSonic: 0, betaSonic: Math.PI / 2 };
  const m2 = mach * mach;
  const gp = gamma + 1;
  const root = Math.sqrt(gp * ((gp / 16) * m2 * m2 - ((3 - gamma) / 8) * m2 + (gamma + 9) / 16));
  const sin2 = ((gp / 4) * m2 - (3 - gamma) / 4 + root) / (gamma * m2);
  const betaSonic = Math.asin(Math.sqrt(Math.min(1, sin2)));
  return { thetaSonic: shockDeflection(mach, betaSonic, gamma), betaSonic };
}
