import { z } from 'zod';
import type { DesignPointsAnalysis } from '../flight/storedAnalysis.ts';
import type { SketchAnalysis } from '../flight/analyseSketch.ts';
import type { SolveResult, SolveStatus, Wave } from '../solver/types.ts';
import { FIRST_DESIGN_POINT_ID, FIRST_DESIGN_POINT_NAME } from './sketch.ts';

/**
 * Schemas of a stored analysis: what the server keeps of its own solve (`sketches.last_result`,
 * `snapshots.result`) and sends in sketch and snapshot answers. They follow the solver's and the
 * flight layer's result types (`SolveResult`, `SketchAnalysis`, `DesignPointsAnalysis`), which
 * stay the definition: each schema `satisfies z.ZodType<…>` of its type, and
 * tests/shared/model/analysis.test.ts checks both directions at type level, so a field added to a
 * result type without its schema fails the type-check instead of being dropped on read.
 *
 * Every stored result is read through `storedAnalysisSchema` [AN1]: version 2 (one entry per
 * design point) as is, a bare analysis stored before design points as the one point a version 1
 * document upgrades to [D4].
 */

/** The solver's status words (`SolveStatus`), in the order lists and filters show them. */
export const SOLVE_STATUSES = ['ok', 'detached', 'subsonic', 'vacuum', 'blunt'] as const satisfies readonly SolveStatus[];
/** An analysis' status: the solver's, or `invalid` when the sketch could not be solved at all. */
export const ANALYSIS_STATUSES = [...SOLVE_STATUSES, 'invalid'] as const;
export const analysisStatusSchema = z.enum(ANALYSIS_STATUSES);
export type AnalysisStatus = (typeof ANALYSIS_STATUSES)[number];

const point = z.tuple([z.number(), z.number()]);

const solveLimitSchema = z.object({
  status: z.enum(['detached', 'subsonic', 'vacuum', 'blunt']),
  surface: z.enum(['upper', 'lower', 'trailingEdge', 'leadingEdge']),
  vertex: z.number(),
  at: point,
  message: z.string(),
  thetaDeg: z.number().optional(),
  thetaMaxDeg: z.number().optional(),
  machBehind: z.number().optional(),
  nuDeg: z.number().optional(),
  nuMaxDeg: z.number().optional(),
});

const facetSchema = z.object({
  index: z.number(),
  from: point,
  to: point,
  length: z.number(),
  phiDeg: z.number(),
  thetaDeg: z.number(),
  turnDeg: z.number(),
  wave: z.enum(['shock', 'fan', 'mach', 'none']),
  solved: z.boolean(),
  mach: z.number().nullable(),
  pRatio: z.number().nullable(),
  tRatio: z.number().nullable(),
  rhoRatio: z.number().nullable(),
  p0Ratio: z.number().nullable(),
  cp: z.number().nullable(),
  cpLinear: z.number().nullable(),
  cpSecondOrder: z.number().nullable(),
  vacuum: z.boolean(),
  xMidOverC: z.number(),
});

const coefficientsSchema = z.object({
  cl: z.number(),
  cd: z.number(),
  cm: z.number(),
  cn: z.number(),
  ca: z.number(),
  xcpOverC: z.number().nullable(),
  liftToDrag: z.number().nullable(),
});

const surfaceCoefficientsSchema = z.object({ cl: z.number(), cd: z.number(), cm: z.number() });

const theoryResultSchema = coefficientsSchema.extend({
  difference: z.object({ cl: z.number().nullable(), cd: z.number().nullable(), cm: z.number().nullable() }),
});

const tailWaveSchema = z.object({
  kind: z.enum(['shock', 'fan', 'none']),
  deflectionDeg: z.number(),
  betaDeg: z.number().optional(),
  machAfter: z.number(),
  pRatioAfter: z.number(),
});

const trailingEdgeSchema = z.object({
  slipDeg: z.number().nullable(),
  pressureRatio: z.number().nullable(),
  upperWave: tailWaveSchema.nullable(),
  lowerWave: tailWaveSchema.nullable(),
  message: z.string().optional(),
});

const waveStateSchema = z.object({ mach: z.number(), pRatio: z.number() });

const fanRaySchema = z.object({
  angleDeg: z.number(),
  end: point,
  pRatio: z.number(),
  mach: z.number(),
  path: z.array(point).optional(),
  pRatioAhead: z.number().optional(),
});

const waveSchema = z.object({
  id: z.string(),
  kind: z.enum(['shock', 'fan', 'mach', 'slip']),
  surface: z.enum(['upper', 'lower', 'trailingEdge']),
  vertex: z.number(),
  origin: point,
  angleDeg: z.number(),
  betaDeg: z.number().optional(),
  rays: z.array(fanRaySchema).optional(),
  end: point,
  endReason: z.enum(['field', 'wave', 'body']),
  upstream: waveStateSchema,
  downstream: waveStateSchema,
  pRatioBehind: z.number(),
  deflectionDeg: z.number(),
  path: z.array(point).optional(),
  pRatioAlong: z.array(z.number()).optional(),
  betaDegAlong: z.array(z.number()).optional(),
  machBehindAlong: z.array(z.number()).optional(),
  pRatioAheadAlong: z.array(z.number()).optional(),
  pRatioBehindAlong: z.array(z.number()).optional(),
}).transform(
  // A result stored before waves had paths reads back with the straight line it was drawn
  // with (origin → end) and each fan ray's pressure ahead taken as its own.
  ({ path, rays, ...w }): Wave => ({
    ...w,
    path: path ?? [w.origin, w.end],
    ...(rays ? { rays: rays.map((r) => ({ ...r, path: r.path ?? [w.origin, r.end], pRatioAhead: r.pRatioAhead ?? r.pRatio })) } : {}),
  }),
);

const sectionGeometrySchema = z.object({
  chord: z.number(),
  noseIndex: z.number(),
  tailIndex: z.number(),
  nose: point,
  tail: point,
  upper: z.array(z.number()),
  lower: z.array(z.number()),
  momentPoint: point,
  maxThicknessRatio: z.number(),
  reference: z.object({ chord: z.number(), leadingEdge: point, source: z.enum(['outline', 'input']) }),
});

/** What `solveSection` returns (`SolveResult`, shared/solver/types.ts). */
export const solveResultSchema = z.object({
  status: z.enum(SOLVE_STATUSES),
  limits: z.array(solveLimitSchema),
  condition: z.object({ mach: z.number(), alphaDeg: z.number(), gamma: z.number() }),
  geometry: sectionGeometrySchema,
  surfaces: z.object({ upper: z.array(facetSchema), lower: z.array(facetSchema) }),
  coefficients: coefficientsSchema.nullable(),
  bySurface: z.object({ upper: surfaceCoefficientsSchema, lower: surfaceCoefficientsSchema }).nullable(),
  theories: z.object({ linear: theoryResultSchema, secondOrder: theoryResultSchema }).nullable(),
  trailingEdge: trailingEdgeSchema,
  waves: z.array(waveSchema),
  // `kind` and `survivor` came with the wave interactions; an older stored meeting stopped both
  // lines there, which reads back as `crossed` (neither went on as the other).
  intersections: z.array(
    z.object({
      at: point,
      waves: z.tuple([z.string(), z.string()]),
      kind: z.enum(['absorbed', 'merged', 'crossed']).default('crossed'),
      survivor: z.string().optional(),
    }),
  ),
  warnings: z.array(z.string()),
}) satisfies z.ZodType<SolveResult>;

const frictionFlagSchema = z.object({
  code: z.enum([
    'laminar-below-range',
    'laminar-above-transition',
    'turbulent-below-transition',
    'turbulent-below-range',
    'turbulent-above-range',
    'turbulent-undefined',
    'no-estimate',
  ]),
  message: z.string(),
});

const surfaceFrictionSchema = z.object({
  reynolds: z.number(),
  cf: z.number(),
  law: z.enum(['laminar', 'turbulent', 'mixed']),
  flags: z.array(frictionFlagSchema),
});

const loadsResultSchema = z.object({
  atmosphere: z.object({
    altitudeM: z.number(),
    geopotentialM: z.number(),
    temperatureK: z.number(),
    molecularTemperatureK: z.number(),
    pressurePa: z.number(),
    densityKgM3: z.number(),
    speedOfSoundMS: z.number(),
    viscosityPaS: z.number(),
    kinematicViscosityM2S: z.number(),
  }),
  gas: z.object({ gamma: z.number(), gasConstantJKgK: z.number(), temperatureK: z.number(), speedOfSoundMS: z.number(), model: z.string() }),
  velocityMS: z.number(),
  dynamicPressurePa: z.number(),
  reynoldsChord: z.number(),
  friction: z.object({
    regime: z.enum(['mixed', 'turbulent', 'laminar', 'none']),
    transitionReynolds: z.number(),
    cfUpper: z.number(),
    cfLower: z.number(),
    cdFriction: z.number(),
    upper: surfaceFrictionSchema.nullable(),
    lower: surfaceFrictionSchema.nullable(),
    flags: z.array(z.string()),
  }),
  cdWave: z.number(),
  cdTotal: z.number(),
  perSpan: z.object({
    liftNPerM: z.number(),
    dragWaveNPerM: z.number(),
    dragFrictionNPerM: z.number(),
    dragTotalNPerM: z.number(),
    momentNMPerM: z.number(),
    hingeMomentNMPerM: z.number().nullable(),
  }),
  total: z.object({ liftN: z.number(), dragN: z.number(), momentNM: z.number(), hingeMomentNM: z.number().nullable() }),
});

/** One design point's analysis (`SketchAnalysis`, shared/flight/analyseSketch.ts). */
export const sketchAnalysisSchema = z.object({
  status: analysisStatusSchema,
  problem: z.string().nullable(),
  result: solveResultSchema.nullable(),
  solvedPoints: z.array(point),
  flap: z
    .object({
      hinge: point,
      hingeXOverC: z.number(),
      deflectionDeg: z.number(),
      flapChordOverC: z.number(),
      hingeMoment: z.object({ exact: z.number().nullable(), linear: z.number().nullable(), secondOrder: z.number().nullable() }),
    })
    .nullable(),
  loads: loadsResultSchema.nullable(),
  loadsNote: z.string().nullable(),
}) satisfies z.ZodType<SketchAnalysis>;

/** Every design point solved together (`DesignPointsAnalysis`, shared/flight/storedAnalysis.ts). */
export const designPointsAnalysisSchema = z.object({
  version: z.literal(2),
  selectedPointId: z.string(),
  points: z.array(z.object({ id: z.string(), name: z.string(), analysis: sketchAnalysisSchema })),
}) satisfies z.ZodType<DesignPointsAnalysis>;

/**
 * A stored result as read back [AN1]: version 2 as is, or a bare analysis stored before design
 * points, upgraded to the one point `FIRST_DESIGN_POINT_ID` (the id a version 1 document's point
 * gets on every read).
 */
export const storedAnalysisSchema = z.union([
  designPointsAnalysisSchema,
  sketchAnalysisSchema.transform(
    (analysis): DesignPointsAnalysis => ({
      version: 2,
      selectedPointId: FIRST_DESIGN_POINT_ID,
      points: [{ id: FIRST_DESIGN_POINT_ID, name: FIRST_DESIGN_POINT_NAME, analysis }],
    }),
  ),
]);
