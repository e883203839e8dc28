import type { SketchAnalysis } from '@shared/flight/analyseSketch';
import { formatQuantity, type UnitSystem } from '@shared/flight/units';
import { formatNumber } from '@shared/format/number';
import type { DesignPoint, SketchDocument } from '@shared/model/sketch';

/**
 * The caption under an exported picture of the canvas (PNG): the sketch's title, then the
 * design point and its condition, then the theory the wave map and its colours come from, with
 * the status when the theory stopped holding somewhere. The caution follows (SketchCanvas adds
 * it to every picture).
 */
export function pictureCaption(title: string, doc: SketchDocument, point: DesignPoint, analysis: SketchAnalysis | null, units: UnitSystem): { title: string; lines: string[] } {
  const c = point.condition;
  const parts = [
    `M ${formatNumber(c.mach, 4)}`,
    `α ${formatNumber(c.alphaDeg, 4)}°`,
    `γ ${formatNumber(c.gamma, 4)}`,
    c.altitudeM === null ? 'no altitude' : `altitude ${formatQuantity(c.altitudeM, 'altitude', units, 5)}`,
    ...(doc.flap ? [`flap δ ${formatNumber(point.flapDeflectionDeg, 4)}° (hinge at x/c ${formatNumber(doc.flap.hingeXOverC, 3)})`] : []),
  ];
  const status = analysis?.status ?? null;
  const statusText = status === null ? 'not solved' : status === 'ok' ? 'attached flow over the whole section' : `status ${status}: ${analysis?.result?.limits[0]?.message ?? analysis?.problem ?? ''}`.trim();
  return {
    title: `Shockwright · ${title}`,
    lines: [
      `Design point “${point.name}”: ${parts.join(', ')}`,
      `Wave map and colours (p/p∞): shock-expansion theory (exact oblique shocks and Prandtl-Meyer fans, facet by facet); ${statusText}`,
    ],
  };
}
