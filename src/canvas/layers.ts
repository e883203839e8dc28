/** What the canvas draws; each can be switched off from the toolbar. */
export interface LayerSettings {
  grid: boolean;
  shocks: boolean;
  fans: boolean;
  machLines: boolean;
  slipLine: boolean;
  surfaceCp: boolean;
  limits: boolean;
  /** The uniform regions between the waves, filled by pressure. */
  pressureField: boolean;
  /** Where waves meet: absorbed rays, merged shocks, crossings. */
  meetings: boolean;
}

export const DEFAULT_LAYERS: LayerSettings = {
  grid: true,
  shocks: true,
  fans: true,
  machLines: true,
  slipLine: true,
  surfaceCp: true,
  limits: true,
  pressureField: true,
  meetings: true,
};

export const LAYER_LABELS: Record<keyof LayerSettings, string> = {
  grid: 'Grid and scale',
  shocks: 'Shocks',
  fans: 'Expansion fans',
  machLines: 'Mach lines',
  slipLine: 'Slip line',
  surfaceCp: 'Surface Cp shading',
  limits: 'Limit markers',
  pressureField: 'Pressure field',
  meetings: 'Wave meetings',
};

/** How the legend and tooltips state pressure. */
export const LEGEND_MODES = ['pressureRatio', 'cp'] as const;
export type LegendMode = (typeof LEGEND_MODES)[number];
