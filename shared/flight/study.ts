import type { SketchCase } from '../model/sketch.ts';
import {
  STUDY_COLUMNS,
  STUDY_MAX_POINTS,
  alphaValues,
  flapValues,
  machValues,
  packStudyRows,
  type StudyDefinition,
  type StudyMachSummary,
  type StudyResults,
  type StudyRow,
  type StudyStatus,
} from '../model/study.ts';
import { maxDeflection } from '../solver/maxDeflection.ts';
import { TRANSITION_REYNOLDS_DEFAULT } from './skinFriction.ts';
import { analysePrepared, prepareSketch, type PreparedSketch, type SketchAnalysis } from './analyseSketch.ts';
import { itemAt } from '../util/invariant.ts';

/**
 * The study engine: expands a definition into points (flap outermost, then Mach, then α) and
 * analyses each with the code of a single analysis ([ST1]: `prepareSketch` once per flap
 * deflection, `analysePrepared` per point, wave map off), keeping one compact row per point (no
 * facet arrays). Pure and synchronous per step, so the browser worker, the server and the bench
 * run it alike; progress is reported through a callback and a cancel flag is checked between
 * points.
 */

export interface StudyPlan {
  machs: number[];
  alphasDeg: number[];
  flapsDeg: (number | null)[];
  altitudeM: number | null;
  friction: StudyDefinition['friction'];
  transitionReynolds: number;
  total: number;
}

export type PlanAnswer = { ok: true; plan: StudyPlan } | { ok: false; reason: string };

export function planStudy(doc: SketchCase, def: StudyDefinition): PlanAnswer {
  const machs = machValues(def.mach);
  const alphasDeg = alphaValues(def.alpha);
  const flapsDeg = flapValues(def.flapDeg, doc.flap ? doc.flap.deflectionDeg : null);
  const total = machs.length * alphasDeg.length * flapsDeg.length;
  if (total === 0) return { ok: false, reason: 'The study has no points: check the Mach and α ranges.' };
  if (total > STUDY_MAX_POINTS) return { ok: false, reason: `The study has ${total} points; at most ${STUDY_MAX_POINTS} are allowed.` };
  return { ok: true, plan: { machs, alphasDeg, flapsDeg, altitudeM: def.altitudeM, friction: def.friction, transitionReynolds: def.transitionReynolds ?? TRANSITION_REYNOLDS_DEFAULT, total } };
}

/** The row a single analysis gives for one point (also what tests compare against). */
export function studyRow(analysis: SketchAnalysis, mach: number, alphaDeg: number, flapDeg: number | null): StudyRow {
  const r = analysis.result;
  const c = r?.coefficients ?? null;
  const lin = r?.theories?.linear ?? null;
  const sec = r?.theories?.secondOrder ?? null;
  const friction = analysis.loads && analysis.loads.friction.regime !== 'none' ? analysis.loads.friction.cdFriction : null;
  const cdTotal = c ? c.cd + (friction ?? 0) : null;
  const ch = analysis.flap?.hingeMoment ?? null;
  return {
    mach,
    alphaDeg,
    flapDeg,
    status: analysis.status as StudyStatus,
    cl: c?.cl ?? null,
    cd: c?.cd ?? null,
    cdFriction: friction,
    cdTotal,
    cm: c?.cm ?? null,
    xcpOverC: c?.xcpOverC ?? null,
    liftToDrag: c && cdTotal !== null && Math.abs(cdTotal) > 1e-12 ? c.cl / cdTotal : null,
    liftToDragWave: c?.liftToDrag ?? null,
    chExact: ch?.exact ?? null,
    chLinear: ch?.linear ?? null,
    chSecondOrder: ch?.secondOrder ?? null,
    clLinear: lin?.cl ?? null,
    cdLinear: lin?.cd ?? null,
    cmLinear: lin?.cm ?? null,
    clSecondOrder: sec?.cl ?? null,
    cdSecondOrder: sec?.cd ?? null,
    cmSecondOrder: sec?.cm ?? null,
    liftNPerM: analysis.loads?.perSpan.liftNPerM ?? null,
    dragNPerM: analysis.loads?.perSpan.dragTotalNPerM ?? null,
    momentNMPerM: analysis.loads?.perSpan.momentNMPerM ?? null,
    hingeMomentNMPerM: analysis.loads?.perSpan.hingeMomentNMPerM ?? null,
    limit: analysis.problem ?? r?.limits[0]?.message ?? null,
  };
}

export interface StudyProgress {
  done: number;
  total: number;
}

/** A study being computed: call `step` until it returns true, then `finish`. */
export interface StudyRun {
  readonly plan: StudyPlan;
  readonly rows: StudyRow[];
  /** Computes points until `budget()` says stop (checked between points) or all are done. */
  step(budget: () => boolean): boolean;
  finish(): StudyResults;
}

export function startStudy(doc: SketchCase, plan: StudyPlan): StudyRun {
  const rows: StudyRow[] = [];
  const { machs, alphasDeg, flapsDeg } = plan;
  const perFlap = machs.length * alphasDeg.length;
  /** First-facet angles (degrees) of each surface, for the nose detachment boundary. */
  let noseFacets: { upperPhiDeg: number; lowerPhiDeg: number } | null = null;
  let prepared: PreparedSketch | null = null;
  let preparedFor = -1;

  return {
    plan,
    rows,
    step(budget) {
      while (rows.length < plan.total) {
        const i = rows.length;
        const f = Math.floor(i / perFlap);
        const m = Math.floor((i % perFlap) / alphasDeg.length);
        const a = i % alphasDeg.length;
        const flapDeg = itemAt(flapsDeg, f);
        const mach = itemAt(machs, m);
        const alphaDeg = itemAt(alphasDeg, a);
        const options = { waves: false, mach, alphaDeg, flapDeg, altitudeM: plan.altitudeM, friction: plan.friction, transitionReynolds: plan.transitionReynolds };
        if (preparedFor !== f) {
          prepared = prepareSketch(doc, options);
          preparedFor = f;
        }
        const analysis = analysePrepared(prepared!, options);
        const result = analysis.result;
        const [upperNose] = result?.surfaces.upper ?? [];
        const [lowerNose] = result?.surfaces.lower ?? [];
        if (!noseFacets && result && result.status !== 'blunt' && upperNose && lowerNose) {
          noseFacets = { upperPhiDeg: upperNose.phiDeg, lowerPhiDeg: lowerNose.phiDeg };
        }
        rows.push(studyRow(analysis, mach, alphaDeg, flapDeg));
        if (budget()) break;
      }
      return rows.length >= plan.total;
    },
    finish() {
      return {
        version: 1,
        machs,
        alphasDeg,
        flapsDeg,
        altitudeM: plan.altitudeM,
        friction: plan.friction,
        transitionReynolds: plan.transitionReynolds,
        chordM: doc.loads.chordM,
        spanM: doc.loads.spanM,
        columns: STUDY_COLUMNS,
        rows: packStudyRows(rows),
        summaries: summarise(rows, plan, noseFacets, doc.condition.gamma),
        counts: countStatuses(rows),
      };
    },
  };
}

function countStatuses(rows: readonly StudyRow[]): Partial<Record<StudyStatus, number>> {
  const counts: Partial<Record<StudyStatus, number>> = {};
  for (const r of rows) counts[r.status] = (counts[r.status] ?? 0) + 1;
  return counts;
}

/**
 * Per Mach: the nose detachment boundary and the best L/D for each deflection. The nose shock
 * of the lower surface detaches when its deflection α − φ_lower exceeds θmax(M∞, γ) (NACA Report
 * 1135, maximum deflection), so the boundary is α = φ_lower + θmax; the upper one at
 * α = φ_upper − θmax. These are the same comparisons the march makes at the nose vertex.
 */
function summarise(rows: readonly StudyRow[], plan: StudyPlan, nose: { upperPhiDeg: number; lowerPhiDeg: number } | null, gamma: number): StudyMachSummary[] {
  const best = new Map<string, StudyMachSummary['best'][number]>();
  for (const r of rows) {
    if (r.status !== 'ok' || r.liftToDrag === null || r.cl === null || r.cdTotal === null) continue;
    const key = `${r.mach}|${r.flapDeg}`;
    const held = best.get(key);
    if (!held || r.liftToDrag > held.liftToDrag) best.set(key, { flapDeg: r.flapDeg, alphaDeg: r.alphaDeg, liftToDrag: r.liftToDrag, cl: r.cl, cdTotal: r.cdTotal });
  }
  return plan.machs.map((mach) => {
    const thetaMaxDeg = (maxDeflection(mach, gamma).thetaMax * 180) / Math.PI;
    return {
      mach,
      detachAlphaHighDeg: nose ? nose.lowerPhiDeg + thetaMaxDeg : null,
      detachAlphaLowDeg: nose ? nose.upperPhiDeg - thetaMaxDeg : null,
      best: plan.flapsDeg.map((f) => best.get(`${mach}|${f}`)).filter((b): b is NonNullable<typeof b> => !!b),
    };
  });
}

export interface RunStudyOptions {
  onProgress?: (progress: StudyProgress) => void;
  /** Checked between points; true stops the study (answer `cancelled`). */
  isCancelled?: () => boolean;
}

export type StudyOutcome =
  | { status: 'done'; results: StudyResults; elapsedMs: number }
  | { status: 'cancelled'; done: number; total: number }
  | { status: 'invalid'; reason: string };

const now = () => (globalThis.performance ? globalThis.performance.now() : Date.now());

/** Runs a whole study at once (server, tests, bench). Progress every `progressEvery` points. */
export function runStudy(doc: SketchCase, def: StudyDefinition, options: RunStudyOptions & { progressEvery?: number } = {}): StudyOutcome {
  const planned = planStudy(doc, def);
  if (!planned.ok) return { status: 'invalid', reason: planned.reason };
  const t0 = now();
  const run = startStudy(doc, planned.plan);
  const every = options.progressEvery ?? 500;
  let cancelled = false;
  while (!run.step(() => (cancelled = options.isCancelled?.() ?? false) || run.rows.length % every === 0)) {
    if (cancelled) return { status: 'cancelled', done: run.rows.length, total: planned.plan.total };
    options.onProgress?.({ done: run.rows.length, total: planned.plan.total });
  }
  options.onProgress?.({ done: planned.plan.total, total: planned.plan.total });
  return { status: 'done', results: run.finish(), elapsedMs: now() - t0 };
}

/**
 * Runs a study in slices of about `sliceMs`, awaiting `pause()` between slices so that the host
 * stays responsive (a worker receives its cancel message, a server answers other requests).
 */
export async function runStudySliced(
  doc: SketchCase,
  def: StudyDefinition,
  options: RunStudyOptions & { pause: () => Promise<void>; sliceMs?: number; slicePoints?: number },
): Promise<StudyOutcome> {
  const planned = planStudy(doc, def);
  if (!planned.ok) return { status: 'invalid', reason: planned.reason };
  const t0 = now();
  const run = startStudy(doc, planned.plan);
  const sliceMs = options.sliceMs ?? 40;
  for (;;) {
    const sliceEnd = now() + sliceMs;
    const sliceStart = run.rows.length;
    let cancelled = false;
    // The clock is read every 32 points: cheap next to a solve, fine-grained enough for slices.
    // `slicePoints` caps a slice by count as well (tests: a study whose length does not depend on
    // how fast the machine solves).
    const finished = run.step(
      () =>
        (cancelled = options.isCancelled?.() ?? false) ||
        (options.slicePoints !== undefined && run.rows.length - sliceStart >= options.slicePoints) ||
        (run.rows.length % 32 === 0 && now() > sliceEnd),
    );
    if (cancelled) return { status: 'cancelled', done: run.rows.length, total: planned.plan.total };
    options.onProgress?.({ done: run.rows.length, total: planned.plan.total });
    if (finished) break;
    await options.pause();
    if (options.isCancelled?.()) return { status: 'cancelled', done: run.rows.length, total: planned.plan.total };
  }
  return { status: 'done', results: run.finish(), elapsedMs: now() - t0 };
}
