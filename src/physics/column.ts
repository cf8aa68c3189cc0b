/**
 * A 1-D conduction column under a radiating surface: layered properties, the grid and the skin
 * depth. ρc ∂T/∂t = ∂/∂z (k ∂T/∂z), z downward; at the surface εσT⁴ = F + k ∂T/∂z; at the bottom
 * an interior heat flux q enters (common practice; e.g. Spencer, Lebofsky & Sykes 1989, Icarus 78,
 * 337, from memory). Depth profiles follow the exponential form of Hayne et al. (2017, JGR Planets
 * 122, 2371): ρ(z) = ρ_d − (ρ_d − ρ_s) e^(−z/H), and the contact conductivity with the same form.
 * The radiative part of the conductivity is k = k_c (1 + χ (T/350 K)³) (Hayne et al. 2017, eq. A4,
 * from memory), and the specific heat may be a polynomial in T.
 */
import { requireNumber } from "../errors.js";

export interface ColumnProperties {
  /** Density at the surface and at depth, kg m⁻³. */
  densitySurface: number;
  densityDeep: number;
  /** Contact conductivity at the surface and at depth, W m⁻¹ K⁻¹. */
  conductivitySurface: number;
  conductivityDeep: number;
  /** e-folding depth H of the profile, m (Infinity: homogeneous). */
  eFoldingDepthM: number;
  /** Specific heat c(T) = Σ aᵢ Tⁱ, J kg⁻¹ K⁻¹ (one coefficient: constant). */
  specificHeatPolynomial: readonly number[];
  /** Radiative conductivity factor χ (0: none). */
  radiativeChi: number;
}

export interface GridControls {
  /** Top layer thickness as a fraction of the shortest forcing period's skin depth. */
  topLayerFraction: number;
  /** Ratio of successive layer thicknesses (≥ 1). */
  growth: number;
  /** Total depth in skin depths of the longest forcing period. */
  depthInSkinDepths: number;
  /** Cap on the number of layers. */
  maxLayers: number;
  /** Time steps per shortest forcing period. */
  stepsPerShortestPeriod: number;
  /** A fixed total depth, m, instead of depthInSkinDepths (a slab of given thickness). */
  totalDepthM?: number;
}

export const DEFAULT_GRID: GridControls = {
  topLayerFraction: 0.05,
  growth: 1.15,
  depthInSkinDepths: 4,
  maxLayers: 200,
  stepsPerShortestPeriod: 480,
};

/** Skin depth δ = √(κP/π) of a periodic forcing of period P, m (Carslaw & Jaeger 1959, §2.6). */
export function skinDepthM(conductivity: number, density: number, specificHeat: number, periodSeconds: number): number {
  return Math.sqrt((conductivity * periodSeconds) / (Math.PI * density * specificHeat));
}

/** Thermal inertia I = √(kρc), J m⁻² K⁻¹ s⁻½. */
export function thermalInertia(conductivity: number, density: number, specificHeat: number): number {
  return Math.sqrt(conductivity * density * specificHeat);
}

export function specificHeatAt(p: ColumnProperties, temperatureK: number): number {
  const a = p.specificHeatPolynomial;
  let c = 0;
  for (let i = a.length - 1; i >= 0; i--) c = c * temperatureK + a[i]!;
  return c;
}

export function densityAt(p: ColumnProperties, depthM: number): number {
  if (!Number.isFinite(p.eFoldingDepthM)) return p.densityDeep;
  return p.densityDeep - (p.densityDeep - p.densitySurface) * Math.exp(-depthM / p.eFoldingDepthM);
}

/** Contact conductivity at depth, W m⁻¹ K⁻¹. */
export function contactConductivityAt(p: ColumnProperties, depthM: number): number {
  if (!Number.isFinite(p.eFoldingDepthM)) return p.conductivityDeep;
  return p.conductivityDeep - (p.conductivityDeep - p.conductivitySurface) * Math.exp(-depthM / p.eFoldingDepthM);
}

export interface ColumnGrid {
  /** Layer thicknesses, m, top first. */
  thicknessM: Float64Array;
  /** Depth of each layer's centre, m. */
  centreM: Float64Array;
  /** Density and contact conductivity at each centre. */
  density: Float64Array;
  contactConductivity: Float64Array;
}

/** Geometric grid: top layer a fraction of the short skin depth, growing down to the required depth. */
export function buildColumnGrid(p: ColumnProperties, shortSkinM: number, longSkinM: number, controls: GridControls): ColumnGrid {
  requireNumber("column.grid.topLayerFraction", controls.topLayerFraction, (f) => f > 0 && f <= 1, "0 < fraction ≤ 1");
  requireNumber("column.grid.growth", controls.growth, (g) => g >= 1 && g <= 2, "1 ≤ growth ≤ 2");
  const thicknesses: number[] = [];
  const target = controls.totalDepthM ?? controls.depthInSkinDepths * longSkinM;
  let dz = controls.topLayerFraction * shortSkinM;
  let depth = 0;
  while (depth < target * (1 - 1e-12) && thicknesses.length < controls.maxLayers) {
    const layer = Math.min(dz, target - depth); // the last layer ends exactly at the target depth
    thicknesses.push(layer);
    depth += layer;
    dz *= controls.growth;
  }
  const n = thicknesses.length;
  const grid: ColumnGrid = {
    thicknessM: Float64Array.from(thicknesses),
    centreM: new Float64Array(n),
    density: new Float64Array(n),
    contactConductivity: new Float64Array(n),
  };
  let top = 0;
  for (let i = 0; i < n; i++) {
    grid.centreM[i] = top + thicknesses[i]! / 2;
    grid.density[i] = densityAt(p, grid.centreM[i]!);
    grid.contactConductivity[i] = contactConductivityAt(p, grid.centreM[i]!);
    top += thicknesses[i]!;
  }
  return grid;
}
