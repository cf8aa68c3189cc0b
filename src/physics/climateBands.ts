/**
 * The zonal climate's latitude bands and the meridional heat transport between them.
 *
 * The globe is cut into N bands of equal width in x = sin latitude, so every band holds the same
 * area (dA ∝ dx): 1/N of the sphere. Transport is diffusion in x,
 *   −∂/∂x [D (1 − x²) ∂T/∂x]   (W m⁻²; D in W m⁻² K⁻¹),
 * the form of North 1975 (J. Atmos. Sci. 32, 1301) and Spiegel, Menou & Scharf 2008 (ApJ 681,
 * 1609), with no flux through the poles (1 − x² = 0 there). It is discretised as finite volumes:
 * the flux through the edge between bands j and j+1 is D (1 − x²) (T_{j+1} − T_j)/Δx at that edge,
 * so what leaves one band enters the next and the global sum of the transport is zero to rounding.
 */
import { requireNumber } from "../errors.js";

export interface BandGrid {
  readonly count: number;
  /** x = sin latitude at each band's centre. */
  readonly centreX: Float64Array;
  /** Latitude of each band's centre, rad (south to north). */
  readonly latitudeRad: Float64Array;
  /** x at the N + 1 edges, −1 … 1. */
  readonly edgeX: Float64Array;
  /** Share of the sphere's area in each band (1/N). */
  readonly areaFraction: Float64Array;
}

export function bandGrid(count: number): BandGrid {
  requireNumber("climate.bands", count, (n) => Number.isInteger(n) && n >= 1 && n <= 2000, "an integer from 1 to 2000");
  const edgeX = new Float64Array(count + 1);
  for (let j = 0; j <= count; j++) edgeX[j] = -1 + (2 * j) / count;
  edgeX[count] = 1;
  const centreX = new Float64Array(count);
  const latitudeRad = new Float64Array(count);
  const areaFraction = new Float64Array(count).fill(1 / count);
  for (let j = 0; j < count; j++) {
    centreX[j] = 0.5 * (edgeX[j]! + edgeX[j + 1]!);
    latitudeRad[j] = Math.asin(centreX[j]!);
  }
  return { count, centreX, latitudeRad, edgeX, areaFraction };
}

/**
 * Meridional diffusion on a band grid: `coupling[j]` (W m⁻² K⁻¹) links band j and band j+1, so the
 * transport into band j is coupling[j](T_{j+1} − T_j) − coupling[j−1](T_j − T_{j−1}).
 */
export interface MeridionalDiffusion {
  readonly coefficientWPerM2K: number;
  /** N − 1 couplings D (1 − x²)/Δx² at the interior edges. */
  readonly coupling: Float64Array;
}

export function meridionalDiffusion(grid: BandGrid, coefficientWPerM2K: number): MeridionalDiffusion {
  requireNumber("climate.diffusion", coefficientWPerM2K, (d) => d >= 0, "D ≥ 0 W m⁻² K⁻¹");
  const n = grid.count;
  const coupling = new Float64Array(Math.max(n - 1, 0));
  for (let j = 0; j < n - 1; j++) {
    const x = grid.edgeX[j + 1]!;
    const dx = grid.centreX[j + 1]! - grid.centreX[j]!;
    const width = grid.edgeX[j + 1]! - grid.edgeX[j]!;
    // Flux D(1 − x²)ΔT/dx through the edge, per unit of the band's width in x.
    coupling[j] = (coefficientWPerM2K * (1 - x * x)) / (dx * width);
  }
  return { coefficientWPerM2K, coupling };
}

/** Transport into each band, W m⁻², for temperatures `t`, written to `out`. */
export function applyDiffusion(diffusion: MeridionalDiffusion, t: ArrayLike<number>, out: Float64Array): void {
  const k = diffusion.coupling;
  const n = out.length;
  for (let j = 0; j < n; j++) out[j] = 0;
  for (let j = 0; j < n - 1; j++) {
    const flow = k[j]! * (t[j + 1]! - t[j]!);
    out[j]! += flow;
    out[j + 1]! -= flow;
  }
}
