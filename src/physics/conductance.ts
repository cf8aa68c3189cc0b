/**
 * Lateral heat exchange linear in the temperature difference between linked cells (a conductance
 * network: diffusion between neighbouring latitude bands or grid cells, discretised):
 *   heat from cell b into cell a = G_ab (T_b − T_a)   W per m² of the WHOLE surface,
 * so cell a, of area weight w_a, receives X_a = Σ_b G_ab (T_b − T_a) / w_a per m² of its own area.
 * Every link moves heat from one cell to the other, so Σ_a w_a X_a = 0 exactly (energy conserved).
 * The Jacobian is the weighted graph Laplacian: sparse, one entry per link end plus the diagonal;
 * its product with a vector costs one pass over the links (what a matrix-free periodic solve uses).
 */
import { CalorbitError } from "../errors.js";
import type { ExchangeOperator } from "../model/exchange.js";

export interface ConductanceLink {
  /** Indices of the two linked cells (distinct, in range). */
  a: number;
  b: number;
  /** G ≥ 0, W m⁻² K⁻¹ per unit of the whole surface's area. */
  conductanceWPerM2K: number;
}

export class ConductanceExchange implements ExchangeOperator {
  private readonly from: Int32Array;
  private readonly to: Int32Array;
  /** G / w of each link end: the coefficient in cell a's balance, and in cell b's. */
  private readonly perAreaA: Float64Array;
  private readonly perAreaB: Float64Array;
  /** Cells (the temperature arrays handed in may be longer: a state with its sensitivities). */
  private readonly n: number;

  constructor(links: readonly ConductanceLink[], areaWeights: readonly number[]) {
    const n = areaWeights.length;
    this.n = n;
    this.from = new Int32Array(links.length);
    this.to = new Int32Array(links.length);
    this.perAreaA = new Float64Array(links.length);
    this.perAreaB = new Float64Array(links.length);
    links.forEach((link, k) => {
      const { a, b, conductanceWPerM2K: g } = link;
      const ok = (i: number) => Number.isInteger(i) && i >= 0 && i < n;
      if (!ok(a) || !ok(b) || a === b || !(g >= 0 && Number.isFinite(g))) {
        throw new CalorbitError("INVALID_ARGUMENT", "a conductance link is not between two cells of the surface", [
          { path: `exchange.links[${k}]`, given: `cells ${a} and ${b}, G = ${g}`, allowed: `two different cells 0..${n - 1}, 0 ≤ G < ∞ W m⁻² K⁻¹` },
        ]);
      }
      this.from[k] = a;
      this.to[k] = b;
      this.perAreaA[k] = g / areaWeights[a]!;
      this.perAreaB[k] = g / areaWeights[b]!;
    });
  }

  addFlux(_E: number, temperatureK: ArrayLike<number>, out: Float64Array): void {
    this.addLaplacian(temperatureK, out);
  }

  addJacobian(_E: number, _temperatureK: ArrayLike<number>, jacobian: Float64Array): void {
    const n = this.n;
    for (let k = 0; k < this.from.length; k++) {
      const a = this.from[k]!;
      const b = this.to[k]!;
      jacobian[a * n + a] = jacobian[a * n + a]! - this.perAreaA[k]!;
      jacobian[a * n + b] = jacobian[a * n + b]! + this.perAreaA[k]!;
      jacobian[b * n + b] = jacobian[b * n + b]! - this.perAreaB[k]!;
      jacobian[b * n + a] = jacobian[b * n + a]! + this.perAreaB[k]!;
    }
  }

  /** The exchange is linear in T, so its Jacobian product is the exchange of v itself. */
  addJacobianProduct(_E: number, _temperatureK: ArrayLike<number>, v: ArrayLike<number>, out: Float64Array): void {
    this.addLaplacian(v, out);
  }

  /** out_a += Σ G (x_b − x_a) / w_a over the links (the weighted graph Laplacian applied to x). */
  private addLaplacian(x: ArrayLike<number>, out: Float64Array): void {
    for (let k = 0; k < this.from.length; k++) {
      const a = this.from[k]!;
      const b = this.to[k]!;
      const difference = x[b]! - x[a]!;
      out[a] = out[a]! + this.perAreaA[k]! * difference;
      out[b] = out[b]! - this.perAreaB[k]! * difference;
    }
  }
}
