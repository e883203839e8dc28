/**
 * Solver constants and tolerances. Units are in the names; angles are radians unless the name
 * says `Deg`. Lengths relative to the chord say `Chords`.
 */

/** Ratio of specific heats of air, used when the input leaves γ out (common practice). */
export const GAMMA_AIR = 1.4;

/**
 * A facet at the nose or the tail is a vertical face (→ `blunt`) when its direction is within this
 * angle of the y axis: |dx| ≤ tan(1e-9)·|dy|. An angular test, so a tiny facet sloped at any real
 * angle is never taken for a vertical face, whatever its length (common practice: a scale-free
 * tolerance on a direction).
 */
export const BLUNT_FACE_ANGLE_RAD = 1e-9;

/** A turn (or a first-facet deflection) smaller than this is no wave at all / a Mach line. */
export const ZERO_TURN_RAD = 1e-12;

/** Residual on θ(β) − θ at which the oblique-shock root stops (radians). */
export const SHOCK_ROOT_TOLERANCE_RAD = 1e-14;

/** Residual on ν(M) − ν at which the Prandtl-Meyer inverse stops (radians). */
export const PRANDTL_MEYER_TOLERANCE_RAD = 1e-14;

/**
 * An expansion whose Prandtl-Meyer angle reaches ν_max·(1 − this) is reported as `vacuum`: the
 * Mach number there is already astronomically large (≈ 1e9 for air) and the pressure is zero to
 * double precision, so we stop before the arithmetic does.
 */
export const VACUUM_MARGIN_RELATIVE = 1e-9;

/** The trailing-edge matching stops when the slip-line direction is known to this (radians). */
export const TAIL_ROOT_TOLERANCE_RAD = 1e-13;

/** Field box half-margin around the section's bounding box, in chords (default). */
export const FIELD_EXTENT_CHORDS_DEFAULT = 1.5;

/**
 * Most interior rays drawn in an expansion fan, besides the head and tail rays: a fan is
 * marched as head, tail and up to this many rays between them, evenly in Prandtl-Meyer turning.
 */
export const FAN_INTERIOR_RAYS_MAX = 3;

/** Fewest interior rays of a fan, however small its turn (`fanInteriorRays`). */
export const FAN_INTERIOR_RAYS_MIN = 1;

/**
 * The most Prandtl-Meyer turning between neighbouring rays of a fan, degrees, until
 * FAN_INTERIOR_RAYS_MAX interior rays are reached (`fanInteriorRays`): a fan turning up to 0.5°
 * (every fan of a finely faceted arc: 0.14° per vertex on a 6 % biconvex of 200 vertices) has
 * one interior ray, 0.5°–0.75° two, more than 0.75° three (as every fan had before). A discretisation of the wave map only; the surface pressures are the
 * march's, whatever the rays.
 */
export const FAN_RAY_STEP_DEG_DEFAULT = 0.25;

/** Wave crossings closer than this (in chords) to a wave's origin are the shared origin itself. */
export const WAVE_ORIGIN_EPS_CHORDS = 1e-9;

/** Theory differences are null when the exact coefficient is smaller than this in magnitude. */
export const COEFFICIENT_ZERO = 1e-9;

/** Warn that thin-airfoil theories are outside their small-deflection assumption above this. */
export const SMALL_DEFLECTION_WARNING_DEG = 10;

/** Warn when a shock's deflection is within this of the maximum deflection. */
export const NEAR_DETACHMENT_WARNING_DEG = 1;

/** Warn when the Mach number behind a shock is below this (but still supersonic). */
export const NEAR_SONIC_WARNING_MACH = 1.1;

/** Warn that a constant γ (calorically perfect gas) is approximate above this free-stream Mach. */
export const PERFECT_GAS_WARNING_MACH = 5;

/** Radians → degrees. */
export const DEG_PER_RAD = 180 / Math.PI;
/** Degrees → radians. */
export const RAD_PER_DEG = Math.PI / 180;
