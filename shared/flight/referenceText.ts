import type { SketchAnalysis } from './analyseSketch.ts';
import { formatNumber } from '../format/number.ts';

/**
 * The sentences that say what an analysis' numbers are referred to and how they were made,
 * shared by the results panel, the loads panel and the PDF report so that all three say the same.
 */

const n = (v: number, digits = 4) => formatNumber(v, digits);

/**
 * What every coefficient is over: the section as drawn (chord, leading edge, moment point) and,
 * with a flap, the flap chord. `chordText` is the physical chord as the reader's units print it.
 */
export function referenceSentence(analysis: SketchAnalysis, chordText?: string): string | null {
  const r = analysis.result;
  if (!r) return null;
  const ref = r.geometry.reference;
  const mp = r.geometry.momentPoint;
  const drawn = analysis.flap ? 'the section as drawn (the flap deflection does not change it)' : 'the section as drawn';
  const parts = [
    `Reference: ${drawn}, chord c = ${n(ref.chord)} drawing units${chordText ? ` (${chordText})` : ''} from the leading edge (${n(ref.leadingEdge[0])}, ${n(ref.leadingEdge[1])}).`,
    `cl, cd over q∞·c; cm over q∞·c² about (${n(mp[0])}, ${n(mp[1])}), nose up +; x_cp/c and x/c from the leading edge.`,
  ];
  if (analysis.flap) {
    parts.push(`ch over q∞·c_f² about the hinge, c_f = ${n(analysis.flap.flapChordOverC)} c (drawn), trailing edge down +.`);
  }
  return parts.join(' ');
}

/** The free-stream gas model of the loads, or null without loads. */
export function gasModelSentence(analysis: SketchAnalysis): string | null {
  const l = analysis.loads;
  if (!l) return null;
  return `${l.gas.model} Here γ = ${n(l.gas.gamma, 5)}, T = ${n(l.gas.temperatureK, 5)} K, a = ${n(l.gas.speedOfSoundMS, 5)} m/s.`;
}

/** How friction was estimated, in one sentence (regime, transition, method). */
export function frictionSentence(analysis: SketchAnalysis): string | null {
  const l = analysis.loads;
  if (!l) return null;
  const f = l.friction;
  if (f.regime === 'none') return 'No friction estimate (wave drag only).';
  const regime =
    f.regime === 'mixed'
      ? `mixed laminar/turbulent flow with transition at Re ${formatNumber(f.transitionReynolds, 3)} (Prandtl's transition formula)`
      : `${f.regime} flow over the whole length`;
  return `Friction: flat-plate estimate on each surface's wetted length, ${regime}, compressible by the reference-temperature method (Sommer & Short).`;
}
