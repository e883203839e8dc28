import type { Facet, SolveResult, Wave } from '@shared/solver/types';
import { cpFromPressureRatio } from './colors';
import type { LegendMode } from './layers';
import { formatNumber } from '@shared/format/number';

export interface Tooltip {
  title: string;
  lines: string[];
}

const KIND: Record<Wave['kind'], string> = {
  shock: 'Oblique shock',
  fan: 'Expansion fan',
  mach: 'Mach line',
  slip: 'Slip line',
};

function place(w: Wave): string {
  if (w.surface === 'trailingEdge') return 'trailing edge';
  if (w.id.startsWith('wave_slip_')) return `${w.surface} stream, where two shocks merged`;
  if (w.id.startsWith('wave_tail_')) return `trailing edge, ${w.surface} stream`;
  return `${w.surface} surface, vertex ${w.vertex}`;
}

function pressure(p: number, mode: LegendMode, result: SolveResult): string {
  if (mode === 'cp') return `Cp ${formatNumber(cpFromPressureRatio(p, result.condition.mach, result.condition.gamma), 4)}`;
  return `p/p∞ ${formatNumber(p, 4)}`;
}

/**
 * Hover text for a wave (and, for a fan, the ray under the pointer). A shock that bends (it
 * absorbed rays or merged) also says β, M₂ and p₂/p₁ on the `segment` under the pointer.
 */
export function waveTooltip(wave: Wave, ray: number | null, result: SolveResult, mode: LegendMode, segment = 0): Tooltip {
  const lines: string[] = [];
  const fanRay = wave.kind === 'fan' && ray !== null && wave.rays ? wave.rays[ray] : null;
  const angle = fanRay ? fanRay.angleDeg : wave.angleDeg;
  let angleLine = `angle ${formatNumber(angle, 4)}° from the x axis`;
  if (wave.betaDeg !== undefined) angleLine += `, β ${formatNumber(wave.betaDeg, 4)}°`;
  lines.push(angleLine);
  if (wave.kind === 'shock' || wave.kind === 'fan') lines.push(`turns the flow ${formatNumber(Math.abs(wave.deflectionDeg), 3)}°`);
  if (wave.kind === 'slip') {
    lines.push(`M ${formatNumber(wave.upstream.mach, 4)} above, ${formatNumber(wave.downstream.mach, 4)} below`);
    lines.push(pressure(wave.pRatioBehind, mode, result) + ' on both sides');
  } else {
    lines.push(`M ${formatNumber(wave.upstream.mach, 4)} → ${formatNumber(wave.downstream.mach, 4)}`);
    lines.push(`${pressure(wave.upstream.pRatio, mode, result)} → ${pressure(wave.downstream.pRatio, mode, result).replace(/^(Cp|p\/p∞) /, '')}`);
    if (wave.kind === 'shock') lines.push(`pressure ratio across ${formatNumber(wave.downstream.pRatio / wave.upstream.pRatio, 4)}`);
    const along = wave.pRatioAlong;
    if (wave.kind === 'shock' && along && along.length > 1) {
      const k = Math.min(Math.max(0, segment), along.length - 1);
      const beta = wave.betaDegAlong?.[k];
      const m2 = wave.machBehindAlong?.[k];
      lines.push(
        `here (part ${k + 1} of ${along.length}): ` +
          [beta !== undefined ? `β ${formatNumber(beta, 4)}°` : null, m2 !== undefined ? `M₂ ${formatNumber(m2, 4)}` : null, `p₂/p₁ ${formatNumber(along[k] as number, 4)}`]
            .filter((x) => x !== null)
            .join(', '),
      );
    }
    if (fanRay) lines.push(`this ray: M ${formatNumber(fanRay.mach, 4)}, ${pressure(fanRay.pRatio, mode, result)}`);
  }
  const rayNote = fanRay && wave.rays ? ` (ray ${(ray ?? 0) + 1} of ${wave.rays.length})` : '';
  return { title: `${KIND[wave.kind]}${rayNote} · ${place(wave)}`, lines };
}

/** The facet of `result` drawn from input edge `index`, with its surface. */
export function findFacet(result: SolveResult, index: number): { facet: Facet; surface: 'upper' | 'lower' } | null {
  const up = result.surfaces.upper.find((f) => f.index === index);
  if (up) return { facet: up, surface: 'upper' };
  const low = result.surfaces.lower.find((f) => f.index === index);
  return low ? { facet: low, surface: 'lower' } : null;
}

/** Hover text for a facet: its Mach number and Cp (with the thin-airfoil values beside). */
export function facetTooltip(index: number, result: SolveResult): Tooltip | null {
  const found = findFacet(result, index);
  if (!found) return null;
  const { facet, surface } = found;
  const title = `Facet ${index} · ${surface} surface`;
  const theories =
    facet.cpLinear === null || facet.cpSecondOrder === null
      ? null
      : `linear ${formatNumber(facet.cpLinear, 4)}, second-order ${formatNumber(facet.cpSecondOrder, 4)}`;
  if (facet.vacuum && facet.cp !== null) {
    return { title, lines: [`vacuum limit: p = 0, Cp ${formatNumber(facet.cp, 4)}`, ...(theories ? [`Cp ${theories}`] : [])] };
  }
  if (!facet.solved || facet.mach === null || facet.cp === null || facet.pRatio === null) {
    return { title, lines: ['not solved: the march stopped before this facet', ...(theories ? [`Cp ${theories}`] : [])] };
  }
  return {
    title,
    lines: [
      `M ${formatNumber(facet.mach, 4)}, Cp ${formatNumber(facet.cp, 4)}`,
      `p/p∞ ${formatNumber(facet.pRatio, 4)}, θ ${formatNumber(facet.thetaDeg, 3)}°`,
      ...(theories ? [`Cp ${theories}`] : []),
    ],
  };
}
