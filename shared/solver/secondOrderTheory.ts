/** Busemann's coefficients of the second-order pressure law Cp = C1·θ + C2·θ². */
export interface BusemannCoefficients {
  c1: number;
  c2: number;
}

/**
 * Busemann's second-order coefficients C1 = 2/√(M²−1) and
 * C2 = ((γ+1)M⁴ − 4(M²−1)) / (2(M²−1)²) for free-stream Mach `mach` > 1.
 *
 * Edge cases: as M → 1⁺ both grow without bound; as M → ∞, C1 → 0 and C2 → (γ+1)/2.
 *
 * Source: Busemann's second-order theory (e.g. Liepmann & Roshko, "Elements of Gasdynamics",
 * from memory; NACA Report 1135, from memory).
 */
export function busemannCoefficients(mach: number, gamma: number): BusemannCoefficients {
  const b2 = (mach - 1) * (mach + 1);
  const m4 = mach * mach * mach * mach;
  return { c1: 2 / Math.sqrt(b2), c2: ((gamma + 1) * m4 - 4 * b2) / (2 * b2 * b2) };
}

/**
 * Busemann (second-order) pressure coefficient on a surface deflected by `theta` (radians
 * from the free stream, + = compression): Cp = C1·θ + C2·θ², with C1, C2 from
 * `busemannCoefficients`. Expansions (θ < 0) use the same law; the θ² term then raises Cp.
 *
 * Source: Busemann's second-order theory (see `busemannCoefficients`).
 */
export function secondOrderTheoryCp(theta: number, mach: number, gamma: number): number {
  const { c1, c2 } = busemannCoefficients(mach, gamma);
  return c1 * theta + c2 * theta * theta;
}
