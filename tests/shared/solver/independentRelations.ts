/**
 * Textbook relations written out again, plainly and independently of shared/solver, so that
 * tests can check the solver against them. Deliberately simple (bisection, direct formulas,
 * degrees in and out where a textbook would use them); slow is fine here.
 *
 * Sources: NACA Report 1135 (θ-β-M relation, normal-shock and Prandtl-Meyer relations).
 */

const rad = (deg: number) => (deg * Math.PI) / 180;

/** θ(β) in radians from the θ-β-M relation, straight from the textbook form. */
export function thetaFromBeta(m: number, beta: number, g: number): number {
  return Math.atan(
    (2 * (1 / Math.tan(beta)) * (m * m * Math.sin(beta) ** 2 - 1)) / (m * m * (g + Math.cos(2 * beta)) + 2),
  );
}

/** Weak-branch β (radians) for deflection θ (radians) by bisection between μ and the θmax point. */
export function weakBeta(m: number, theta: number, g: number): number {
  // Locate the θmax point by golden-section search, then bisect on the weak side.
  let lo = Math.asin(1 / m);
  let hi = Math.PI / 2;
  for (let i = 0; i < 200; i++) {
    const a = lo + (hi - lo) / 3;
    const b = hi - (hi - lo) / 3;
    if (thetaFromBeta(m, a, g) < thetaFromBeta(m, b, g)) lo = a;
    else hi = b;
  }
  const betaMax = 0.5 * (lo + hi);
  lo = Math.asin(1 / m);
  hi = betaMax;
  for (let i = 0; i < 200; i++) {
    const mid = 0.5 * (lo + hi);
    if (thetaFromBeta(m, mid, g) < theta) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** θmax (radians) by golden-section search on θ(β). */
export function thetaMaxSearch(m: number, g: number): { thetaMax: number; betaAtMax: number } {
  let lo = Math.asin(1 / m);
  let hi = Math.PI / 2;
  for (let i = 0; i < 300; i++) {
    const a = lo + (hi - lo) / 3;
    const b = hi - (hi - lo) / 3;
    if (thetaFromBeta(m, a, g) < thetaFromBeta(m, b, g)) lo = a;
    else hi = b;
  }
  const betaAtMax = 0.5 * (lo + hi);
  return { thetaMax: thetaFromBeta(m, betaAtMax, g), betaAtMax };
}

/** State behind a weak oblique shock: M2 and p2/p1. */
export function shockState(m: number, thetaRad: number, g: number): { beta: number; m2: number; pRatio: number } {
  const beta = weakBeta(m, thetaRad, g);
  const mn1 = m * Math.sin(beta);
  const pRatio = 1 + ((2 * g) / (g + 1)) * (mn1 * mn1 - 1);
  const mn2 = Math.sqrt((mn1 * mn1 * (g - 1) + 2) / (2 * g * mn1 * mn1 - (g - 1)));
  return { beta, m2: mn2 / Math.sin(beta - thetaRad), pRatio };
}

/** Prandtl-Meyer ν(M), radians. */
export function nu(m: number, g: number): number {
  const a = Math.sqrt((g + 1) / (g - 1));
  return a * Math.atan(Math.sqrt((m * m - 1) / (a * a))) - Math.atan(Math.sqrt(m * m - 1));
}

/** Inverse Prandtl-Meyer by bisection on M ∈ [1, 1e6]. */
export function machFromNu(target: number, g: number): number {
  let lo = 1;
  let hi = 1e6;
  for (let i = 0; i < 300; i++) {
    const mid = 0.5 * (lo + hi);
    if (nu(mid, g) < target) lo = mid;
    else hi = mid;
  }
  return 0.5 * (lo + hi);
}

/** State after a Prandtl-Meyer expansion by `turnRad` (> 0): M2 and p2/p1. */
export function fanState(m: number, turnRad: number, g: number): { m2: number; pRatio: number } {
  const m2 = machFromNu(nu(m, g) + turnRad, g);
  const pRatio = ((1 + ((g - 1) / 2) * m * m) / (1 + ((g - 1) / 2) * m2 * m2)) ** (g / (g - 1));
  return { m2, pRatio };
}

/** State after turning by `turnRad` (+ compression via a shock, − expansion via a fan). */
export function turnState(m: number, turnRad: number, g: number): { m2: number; pRatio: number } {
  if (turnRad > 0) return shockState(m, turnRad, g);
  if (turnRad < 0) return fanState(m, -turnRad, g);
  return { m2: m, pRatio: 1 };
}

/** Cp from p/p∞. */
export function cpFromPressure(pRatio: number, mInf: number, g: number): number {
  return (pRatio - 1) / (0.5 * g * mInf * mInf);
}

export { rad };
