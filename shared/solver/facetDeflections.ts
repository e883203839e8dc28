import type { SurfaceChain } from './splitSurfaces';
import type { SurfaceName } from './types';
import { present } from '../util/invariant.ts';

/**
 * Deflection of each facet from the free stream, radians, + = into the flow (compression).
 *
 * The first facet's is θ0 = φ0 − α on the upper surface and α − φ0 on the lower (φ = the facet
 * angle atan2(dy, dx) taken nose → tail, α the incidence, nose up positive). Later facets add
 * the turn at their leading vertex (the change of facet direction, counter-clockwise positive,
 * in (−π, π]) with the upper surface's sign (+) or the lower's (−), so a facet that doubles
 * back never jumps by 2π.
 *
 * Source: common practice (small-disturbance sign convention of Ackeret theory).
 */
export function facetDeflections(
  chain: Pick<SurfaceChain, 'phi' | 'turn'>,
  alpha: number,
  surface: SurfaceName,
): number[] {
  const m = chain.phi.length;
  const out: number[] = new Array(m);
  if (m === 0) return out;
  const turn = chain.turn;
  if (surface === 'upper') {
    let theta = present(chain.phi[0], 0, chain.phi) - alpha;
    out[0] = theta;
    for (let k = 1; k < m; k++) out[k] = theta += present(turn[k], k, turn);
  } else {
    let theta = alpha - present(chain.phi[0], 0, chain.phi);
    out[0] = theta;
    for (let k = 1; k < m; k++) out[k] = theta -= present(turn[k], k, turn);
  }
  return out;
}
