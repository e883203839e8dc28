import { FAN_INTERIOR_RAYS_MAX, FAN_INTERIOR_RAYS_MIN, FAN_RAY_STEP_DEG_DEFAULT, RAD_PER_DEG } from './constants';

/**
 * How many interior rays a fan of `turn` radians of Prandtl-Meyer turning is drawn and marched
 * with, besides its head and tail ray: the fewest that keep neighbouring rays at most `stepDeg`
 * apart in turning, at least FAN_INTERIOR_RAYS_MIN (one: a fan of a finely faceted arc still
 * shows as a fan, and the far field keeps a wave to absorb between two vertices' tail rays)
 * and at most FAN_INTERIOR_RAYS_MAX (a large fan's rays are a quarter of its turn apart).
 *
 * A discretisation of the wave map, not of the surface pressures (the march turns each facet's
 * flow in one step). Each ray is drawn on the Mach line of the state behind it, so a coarser fan
 * is absorbed by a shock a little later; with the default step the nose shocks of finely
 * faceted sections stay within a few per cent in strength, and well under 1 % of the distance
 * in position, of those of three interior rays per fan (tests/shared/solver/
 * fanDiscretisation.test.ts). Edge case: a zero turn gives FAN_INTERIOR_RAYS_MIN.
 *
 * Sources: fans as discrete characteristics, each carrying an equal part of the Prandtl-Meyer
 * turning (the method of characteristics; NACA Report 1135 for ν(M)).
 */
export function fanInteriorRays(turn: number, stepDeg: number = FAN_RAY_STEP_DEG_DEFAULT): number {
  const steps = Math.ceil(Math.abs(turn) / (stepDeg * RAD_PER_DEG) - 1e-9);
  return Math.min(FAN_INTERIOR_RAYS_MAX, Math.max(FAN_INTERIOR_RAYS_MIN, steps - 1));
}
