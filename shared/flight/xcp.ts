import { formatNumber } from '../format/number.ts';

/**
 * Where x_cp/c is shown. The centre of pressure is cm_nose / cn: as the normal force goes to zero
 * the section carries a pure couple and x_cp runs off by chords for tiny changes in cl (4.3 c,
 * then −0.7 c, one degree of α apart near cl = 0), a number with no use as a location. Every view
 * and export leaves it out (a dash, an empty cell) when |cn| < XCP_CN_MIN or x_cp/c lies outside
 * XCP_BAND (a chord ahead of the nose to a chord behind the tail); cm says what the section does
 * there. cn = cl·cos α + cd·sin α (wind to body axes; cd the exact wave drag), which is the
 * solver's own cn. The limits are an engineer's judgement (common practice: x_cp is quoted only
 * with a clear normal force), not a published figure. Stored results keep the solver's value.
 */
export const XCP_CN_MIN = 1e-4;
export const XCP_BAND = { min: -1, max: 2 } as const;
export const XCP_UNDEFINED_NOTE = `x_cp/c undefined when the normal force is near zero (|cn| < ${formatNumber(XCP_CN_MIN)} or x_cp outside ${formatNumber(XCP_BAND.min)} to ${formatNumber(XCP_BAND.max)} chords from the leading edge)`;

/** cn over q∞·c from wind-axis cl, cd at α (radians). */
export function normalForceCoefficient(cl: number, cd: number, alphaRad: number): number {
  return cl * Math.cos(alphaRad) + cd * Math.sin(alphaRad);
}

/** x_cp/c when it means a location (|cn| ≥ XCP_CN_MIN and x_cp/c within XCP_BAND), else null. */
export function shownXcpOverC(xcpOverC: number | null | undefined, cn: number | null | undefined): number | null {
  if (xcpOverC === null || xcpOverC === undefined || cn === null || cn === undefined) return null;
  if (!(Math.abs(cn) >= XCP_CN_MIN)) return null;
  return xcpOverC < XCP_BAND.min || xcpOverC > XCP_BAND.max ? null : xcpOverC;
}

/** True when the solver gave an x_cp/c that the rule above leaves out (the dash wants its note). */
export function xcpLeftOut(xcpOverC: number | null | undefined, cn: number | null | undefined): boolean {
  return xcpOverC !== null && xcpOverC !== undefined && shownXcpOverC(xcpOverC, cn) === null;
}
