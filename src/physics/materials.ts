/**
 * Bulk materials for a heat-storing layer. Areal heat capacity of a layer: C = ρ c h, J m⁻² K⁻¹.
 * Each value names its source; "from memory" marks values not checked against the printed table.
 */
import { requireNumber } from "../errors.js";

export interface Material {
  /** Density ρ, kg m⁻³. */
  densityKgPerM3: number;
  /** Specific heat capacity c, J kg⁻¹ K⁻¹. */
  specificHeatJPerKgK: number;
  /** Thermal conductivity k, W m⁻¹ K⁻¹. */
  conductivityWPerMK: number;
  /** Where the numbers come from. */
  source: string;
}

export const MATERIALS = {
  water: {
    densityKgPerM3: 999.8,
    specificHeatJPerKgK: 4217,
    conductivityWPerMK: 0.56,
    source: "liquid water near 0 °C: Mellon et al. 2008, The Martian Surface ch. 18, Table 18.1",
  },
  seawater: {
    densityKgPerM3: 1025,
    specificHeatJPerKgK: 3990,
    conductivityWPerMK: 0.6,
    source: "typical surface seawater (from memory)",
  },
  ice: {
    densityKgPerM3: 917,
    specificHeatJPerKgK: 2050,
    conductivityWPerMK: 2.2,
    source: "water ice Ih near 0 °C, CRC Handbook of Chemistry and Physics (from memory)",
  },
  rock: {
    densityKgPerM3: 2900,
    specificHeatJPerKgK: 865,
    conductivityWPerMK: 1.75,
    source: "basalt: Mellon et al. 2008, Table 18.1 (ρ 2900; c 830–900 and k 1.12–2.38, midpoints taken)",
  },
  regolith: {
    densityKgPerM3: 1650,
    specificHeatJPerKgK: 850,
    conductivityWPerMK: 0.29,
    source: "dry sand: Mellon et al. 2008, Table 18.1",
  },
  aluminium: {
    densityKgPerM3: 2700,
    specificHeatJPerKgK: 897,
    conductivityWPerMK: 237,
    source: "CRC Handbook of Chemistry and Physics (ρ and k at 27 °C, c at 25 °C)",
  },
} as const satisfies Record<string, Material>;

export type MaterialName = keyof typeof MATERIALS;
export const MATERIAL_NAMES = Object.keys(MATERIALS) as MaterialName[];

/** Areal heat capacity ρ c h of a layer of thickness h (m), J m⁻² K⁻¹. */
export function layerHeatCapacity(material: Material, thicknessM: number): number {
  requireNumber("layer.thickness", thicknessM, (h) => h > 0, "h > 0 m");
  return material.densityKgPerM3 * material.specificHeatJPerKgK * thicknessM;
}
