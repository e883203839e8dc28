/**
 * Shockwright solver: pure gas dynamics and the shock-expansion march for polygonal sections.
 * No Node, DOM or Vue imports, so the server and the browser worker run the same code.
 * See README.md for conventions and invariants.
 */
export * from './constants';
export * from './types';
export { machAngle } from './machAngle';
export { atanNearZero } from './atanNearZero';
export { isentropic, type IsentropicRatios } from './isentropic';
export { normalShock, type NormalShockResult } from './normalShock';
export { shockDeflection } from './shockDeflection';
export { maxDeflection, cotBetaAtMaxDeflection, type MaxDeflection } from './maxDeflection';
export { sonicDeflection, type SonicDeflection } from './sonicDeflection';
export {
  obliqueShock,
  shockCotAngle,
  type AttachedShock,
  type DetachedShock,
  type ObliqueShockResult,
  type ShockBranch,
} from './obliqueShock';
export {
  prandtlMeyer,
  prandtlMeyerMax,
  machFromPrandtlMeyer,
  machAfterExpansion,
  machParameterAfterExpansion,
} from './prandtlMeyer';
export { splitSurfaces, type SplitSection, type SurfaceChain } from './splitSurfaces';
export { facetDeflections } from './facetDeflections';
export { marchSurface, type SurfaceLimit, type SurfaceMarch } from './marchSurface';
export {
  matchTrailingEdge,
  type TailMatch,
  type TailStream,
  type TailTurn,
} from './matchTrailingEdge';
export { integrateLoads, type LoadSurface, type Loads } from './integrateLoads';
export { linearTheoryCp } from './linearTheory';
export { secondOrderTheoryCp, busemannCoefficients, type BusemannCoefficients } from './secondOrderTheory';
export { maxThicknessRatio } from './maxThicknessRatio';
export { traceWaves, type WaveMap, type WaveTraceInput } from './traceWaves';
export { fanInteriorRays } from './fanInteriorRays';
export { interactWaves, type FlowState, type Interactions, type LineSeed, type WaveMeeting } from './interactWaves';
export { crossWaveFamilies, type LineCrossing } from './crossWaveFamilies';
export { bodyHitTest, type BodyHit } from './bodyHitTest';
export { solveSection } from './solveSection';
