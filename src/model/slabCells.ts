/**
 * Many slab cells, one temperature each, with an optional lateral exchange between them:
 *   C dT_i/dt = F_i(E) + q − εσT_i⁴ + X_i(E, T),   in the eccentric anomaly E (dt/dE = (1 − e cos E)/n).
 * The state a multi-cell surface (latitude bands, a longitude–latitude grid) integrates. With one
 * cell and no exchange it is `LumpedBalance`; the engine keeps using that class there.
 */
import { STEFAN_BOLTZMANN } from "../constants.js";
import { checkSurface, type SurfaceProperties } from "../physics/energyBalance.js";
import { meanMotion, type Orbit } from "../physics/orbit.js";
import type { OdeSystem } from "../solve/system.js";
import type { ExchangeOperator } from "./exchange.js";
import type { SurfaceCell } from "./surface.js";

export class SlabCells implements OdeSystem {
  readonly dimension: number;
  private readonly e: number;
  private readonly inverseN: number;
  private readonly emission: number;
  private readonly inverseC: number;
  private readonly q: number;
  private readonly flux: Float64Array;
  /** Scratch for an exchange without a product of its own (made on first use). */
  private denseJacobian: Float64Array | undefined;

  constructor(
    orbit: Orbit,
    surface: SurfaceProperties,
    private readonly cells: readonly SurfaceCell[],
    private readonly exchange: ExchangeOperator | null,
  ) {
    checkSurface(surface);
    this.dimension = cells.length;
    this.e = orbit.eccentricity;
    this.inverseN = 1 / meanMotion(orbit);
    this.emission = surface.emissivity * STEFAN_BOLTZMANN;
    this.inverseC = 1 / surface.heatCapacityJPerM2K;
    this.q = surface.internalFluxWPerM2;
    this.flux = new Float64Array(cells.length);
  }

  timePerAnomaly(E: number): number {
    return (1 - this.e * Math.cos(E)) * this.inverseN;
  }

  derivative(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.dimension;
    const flux = this.flux;
    for (let i = 0; i < n; i++) {
      const t = y[i]!;
      const t2 = t * t;
      flux[i] = this.cells[i]!.forcing.absorbedAt(x) + this.q - this.emission * t2 * t2;
    }
    if (this.exchange) this.exchange.addFlux(x, y, flux);
    const g = this.timePerAnomaly(x) * this.inverseC;
    for (let i = 0; i < n; i++) out[i] = g * flux[i]!;
  }

  /** (∂f/∂y) v: the diagonal of the emission plus the exchange's product (its own, or through its dense Jacobian). */
  jacobianProduct(x: number, y: ArrayLike<number>, v: ArrayLike<number>, out: Float64Array): void {
    const n = this.dimension;
    for (let i = 0; i < n; i++) {
      const t = y[i]!;
      out[i] = -4 * this.emission * t * t * t * v[i]!;
    }
    const exchange = this.exchange;
    if (exchange?.addJacobianProduct) exchange.addJacobianProduct(x, y, v, out);
    else if (exchange) {
      const jac = (this.denseJacobian ??= new Float64Array(n * n));
      jac.fill(0);
      exchange.addJacobian(x, y, jac);
      for (let i = 0; i < n; i++) {
        let s = 0;
        for (let j = 0; j < n; j++) s += jac[i * n + j]! * v[j]!;
        out[i] = out[i]! + s;
      }
    }
    const g = this.timePerAnomaly(x) * this.inverseC;
    for (let i = 0; i < n; i++) out[i] = g * out[i]!;
  }

  jacobian(x: number, y: ArrayLike<number>, out: Float64Array): void {
    const n = this.dimension;
    out.fill(0, 0, n * n);
    for (let i = 0; i < n; i++) {
      const t = y[i]!;
      out[i * n + i] = -4 * this.emission * t * t * t;
    }
    if (this.exchange) this.exchange.addJacobian(x, y, out);
    const g = this.timePerAnomaly(x) * this.inverseC;
    for (let k = 0; k < n * n; k++) out[k] = g * out[k]!;
  }
}
