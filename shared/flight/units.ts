import { formatNumber } from '../format/number.ts';
/**
 * Display units. Everything is computed in SI; a person's choice of SI or US customary is
 * applied only when a value is shown or typed in. Conversion factors are exact by definition
 * (foot = 0.3048 m, pound-mass = 0.45359237 kg, standard gravity 9.80665 m/s²) unless noted.
 */
export const UNIT_SYSTEMS = ['si', 'us'] as const;
export type UnitSystem = (typeof UNIT_SYSTEMS)[number];

const FT = 0.3048;
const LBF = 0.45359237 * 9.80665; // N
const SLUG = LBF / FT; // kg

export const QUANTITIES = {
  length: { si: { label: 'm', factor: 1 }, us: { label: 'ft', factor: FT } },
  altitude: { si: { label: 'm', factor: 1 }, us: { label: 'ft', factor: FT } },
  speed: { si: { label: 'm/s', factor: 1 }, us: { label: 'ft/s', factor: FT } },
  pressure: { si: { label: 'Pa', factor: 1 }, us: { label: 'lbf/ft²', factor: LBF / (FT * FT) } },
  density: { si: { label: 'kg/m³', factor: 1 }, us: { label: 'slug/ft³', factor: SLUG / (FT * FT * FT) } },
  temperature: { si: { label: 'K', factor: 1 }, us: { label: '°R', factor: 1 / 1.8 } },
  viscosity: { si: { label: 'Pa·s', factor: 1 }, us: { label: 'lbf·s/ft²', factor: LBF / (FT * FT) } },
  force: { si: { label: 'N', factor: 1 }, us: { label: 'lbf', factor: LBF } },
  forcePerSpan: { si: { label: 'N/m', factor: 1 }, us: { label: 'lbf/ft', factor: LBF / FT } },
  moment: { si: { label: 'N·m', factor: 1 }, us: { label: 'lbf·ft', factor: LBF * FT } },
  momentPerSpan: { si: { label: 'N·m/m', factor: 1 }, us: { label: 'lbf·ft/ft', factor: LBF } },
} as const;
export type Quantity = keyof typeof QUANTITIES;

/** SI value → the number shown in `system`. */
export function toDisplay(valueSi: number, quantity: Quantity, system: UnitSystem): number {
  return valueSi / QUANTITIES[quantity][system].factor;
}

/** A number typed in `system` → SI. */
export function fromDisplay(value: number, quantity: Quantity, system: UnitSystem): number {
  return value * QUANTITIES[quantity][system].factor;
}

export function unitLabel(quantity: Quantity, system: UnitSystem): string {
  return QUANTITIES[quantity][system].label;
}

/** "12.3 kN/m"-style text with the unit, to `digits` significant figures. */
export function formatQuantity(valueSi: number, quantity: Quantity, system: UnitSystem, digits = 4): string {
  const v = toDisplay(valueSi, quantity, system);
  return `${formatNumber(v, digits)} ${unitLabel(quantity, system)}`;
}
