/**
 * The passband integral ∫B_λ(T)dλ against the blackbody fraction F(0→λT), computed two outside ways:
 * its closed-form series and a printed table. The phase curve's tables rest on this quadrature.
 */
import { describe, expect, it } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import { BandRadiance, bandRadianceDirect } from "../src/physics/planck.js";

/** Second radiation constant c₂ = hc/k, µm K, from the CODATA 2018 exact h, c and k (written out here, not imported). */
const C2_UM_K = (6.62607015e-34 * 299792458) / 1.380649e-23 / 1e-6;

/**
 * Share of a blackbody's emission below wavelength λ at temperature T, by the series
 * F(0→λT) = (15/π⁴) Σₙ (e^(−nx)/n)(x³ + 3x²/n + 6x/n² + 6/n³), x = c₂/(λT)
 * (Widger & Woodall 1976, Bull. Amer. Meteor. Soc. 57, 1217; the same series is in Siegel & Howell,
 * Thermal Radiation Heat Transfer; both from memory). Terms fall like e^(−nx)/n⁴ at worst, so the sum
 * stops once a term is below 1e-18 of it (a few hundred terms at λT = 240,000 µm K).
 */
function blackbodyFraction(lambdaTimesTUmK: number): number {
  const x = C2_UM_K / lambdaTimesTUmK;
  let sum = 0;
  for (let n = 1; n <= 5000; n++) {
    const term = (Math.exp(-n * x) / n) * (x ** 3 + (3 * x * x) / n + (6 * x) / n ** 2 + 6 / n ** 3);
    sum += term;
    if (term < 1e-18 * sum) break;
  }
  return (15 / Math.PI ** 4) * sum;
}

/** Band radiance between two wavelengths (µm) from the series, W m⁻² sr⁻¹. */
function seriesBand(fromUm: number, toUm: number, temperatureK: number): number {
  return ((STEFAN_BOLTZMANN * temperatureK ** 4) / Math.PI) * (blackbodyFraction(toUm * temperatureK) - blackbodyFraction(fromUm * temperatureK));
}

describe("the band integral of Planck's law against the blackbody fraction", () => {
  it("matches the series for F(0→λT) to 1e-9 of the band's value, across bands from 2 to 40 µm and 40 K to 6000 K", () => {
    for (const [fromUm, toUm] of [[2, 2.5], [3, 4], [4, 5], [7.5, 9.5], [8, 14], [15, 20], [20, 40]] as const) {
      for (const t of [40, 150, 391.3, 1000, 2829, 6000]) {
        const reference = seriesBand(fromUm, toUm, t);
        if (reference < 1e-200) continue; // far Wien tail: below anything a map reads
        const direct = bandRadianceDirect({ kind: "tophat", fromM: fromUm * 1e-6, toM: toUm * 1e-6 }, t);
        expect(Math.abs(direct / reference - 1)).toBeLessThan(1e-9);
      }
    }
  });

  it("matches the printed table of F(0→λT) to 5e-5 (Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Table 12.1; from memory)", () => {
    // The printed table was computed with an older c₂ (14,388 µm K against 14,387.77 now) and is quoted
    // to six decimals; the series above agrees with it to 4.2e-5 at worst over these rows.
    const printed: [number, number][] = [
      [1000, 0.000321],
      [2000, 0.066728],
      [2898, 0.250108],
      [4000, 0.480877],
      [6000, 0.737818],
      [10000, 0.914199],
    ];
    const t = 1000;
    const total = (STEFAN_BOLTZMANN * t ** 4) / Math.PI;
    for (const [lambdaT, fraction] of printed) {
      const below = bandRadianceDirect({ kind: "tophat", fromM: 0.05e-6, toM: (lambdaT / t) * 1e-6 }, t) / total;
      expect(Math.abs(below - fraction)).toBeLessThan(5e-5);
    }
  });

  it("tabulates a band in ln T to 1e-6 of the series from 100 K to 6000 K", () => {
    for (const [fromUm, toUm] of [[2, 2.5], [4, 5], [8, 14], [15, 20]] as const) {
      const band = new BandRadiance({ kind: "tophat", fromM: fromUm * 1e-6, toM: toUm * 1e-6 });
      for (let t = 100; t <= 6000; t *= 1.137) expect(Math.abs(band.at(t) / seriesBand(fromUm, toUm, t) - 1)).toBeLessThan(1e-6);
    }
  });
});
