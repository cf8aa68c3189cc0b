import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN } from "../src/constants.js";
import type { ThermalCase } from "../src/model/thermalCase.js";
import { DayNightBalance, exchangeEquilibrium } from "../src/physics/dayNight.js";
import { equilibriumTemperature, stellarFlux } from "../src/physics/flux.js";
import { bandForcing, pointForcing } from "../src/physics/forcing.js";
import { cosZenith, cosZenithFromAngles, dailyMeanInsolation, hourAngle, solarDaySeconds, stellarRightAscension, substellarLongitude } from "../src/physics/geometry.js";
import { trueAnomalyFromEccentric, eccentricAnomaly } from "../src/physics/kepler.js";
import { simulate } from "../src/run/simulate.js";
import { buildThermalModel } from "../src/model/build.js";
import { nominalCase } from "./helpers.js";

const deg = Math.PI / 180;
const YEAR = 3.15576e7;

function withExchange(base: ThermalCase, recirculation: number, weighting: "uniform" | "flux", coefficient = 0): ThermalCase {
  return { ...base, regime: "daynight", exchange: { recirculation, coefficientWPerM2K: coefficient, weighting } };
}

describe("day/night hemispheres", () => {
  // Cowan & Agol 2011, ApJ 729, 54, eqs. 4–5, for the IAU 2015 B3 nominal star at 1 au, A = 0
  // (T₀ = T★√(R★/a) = 393.62 K): ε = 0 → T_day 355.67 K; ε = 0.5 → 323.87 / 234.05 K; ε = 1 → 278.33 K.
  // Values derived in double precision from those equations (../shared/REFERENCES.md).
  const orbit = nominalCase({}).orbit;
  const surface = { albedo: 0, emissivity: 1, heatCapacityJPerM2K: 1e7, internalFluxWPerM2: 0 };
  const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
  const t0 = Math.sqrt(Math.sqrt(s / STEFAN_BOLTZMANN));

  it("has T₀ = 393.62 K for the nominal star at 1 au", () => {
    expect(t0).toBeCloseTo(393.62, 2);
  });

  for (const eps of [0, 0.25, 0.5, 0.75, 1]) {
    it(`reproduces Cowan & Agol's flux-weighted limits at ε = ${eps} to 1e-9`, () => {
      const balance = new DayNightBalance(orbit, surface, SOLAR_LUMINOSITY_W, { recirculation: eps, coefficientWPerM2K: 0, weighting: "flux" });
      const out = new Float64Array(2);
      balance.equilibrium(0, out);
      expect(Math.abs(out[0]! / (t0 * (2 / 3 - (5 * eps) / 12) ** 0.25) - 1)).toBeLessThan(1e-9);
      if (eps > 0) expect(Math.abs(out[1]! / (t0 * (eps / 4) ** 0.25) - 1)).toBeLessThan(1e-9);
    });
  }

  it("gives the published example temperatures (Cowan & Agol 2011, derived)", () => {
    const out = new Float64Array(2);
    new DayNightBalance(orbit, surface, SOLAR_LUMINOSITY_W, { recirculation: 0, coefficientWPerM2K: 0, weighting: "flux" }).equilibrium(0, out);
    expect(out[0]).toBeCloseTo(355.67, 2);
    new DayNightBalance(orbit, surface, SOLAR_LUMINOSITY_W, { recirculation: 0.5, coefficientWPerM2K: 0, weighting: "flux" }).equilibrium(0, out);
    expect(out[0]).toBeCloseTo(323.87, 2);
    expect(out[1]).toBeCloseTo(234.05, 2);
    new DayNightBalance(orbit, surface, SOLAR_LUMINOSITY_W, { recirculation: 0, coefficientWPerM2K: 0, weighting: "uniform" }).equilibrium(0, out);
    expect(out[0]).toBeCloseTo(330.99, 2); // the uniform-dayside value (../shared/REFERENCES.md)
  });

  it("settles to those limits on a circular orbit (periodic solve of the two-state system)", () => {
    const sim = simulate(withExchange(nominalCase({ e: 0 }), 0.5, "flux"), { samples: 0 });
    expect(Math.abs(sim.summary.day!.temperature.meanK / (t0 * (2 / 3 - 5 / 24) ** 0.25) - 1)).toBeLessThan(1e-8);
    expect(Math.abs(sim.summary.night!.temperature.meanK / (t0 * (0.5 / 4) ** 0.25) - 1)).toBeLessThan(1e-8);
    expect(sim.summary.day!.temperature.meanK).toBeCloseTo(323.87, 2);
    expect(sim.summary.night!.temperature.meanK).toBeCloseTo(234.05, 2);
    expect(sim.summary.temperature).toEqual(sim.summary.day!.temperature);
  });

  it("gives the no-redistribution limit at ε = 0: the night side at 0 K exactly, the day side as the formula", () => {
    // Cowan & Agol 2011, eqs. 4–5 at ε = 0: T_day = T₀ (2/3)^¼ = 355.67 K flux-weighted, T₀ (1/2)^¼ =
    // 330.99 K for a uniform dayside (../shared/REFERENCES.md); T_night = T₀ (ε/4)^¼ = 0.
    for (const [weighting, factor, published] of [["flux", 2 / 3, 355.67], ["uniform", 1 / 2, 330.99]] as const) {
      const sim = simulate(withExchange(nominalCase({ e: 0, heatCapacity: 1e7 }), 0, weighting), { samples: 50 });
      expect(Math.abs(sim.summary.day!.temperature.meanK / (t0 * factor ** 0.25) - 1)).toBeLessThan(1e-8);
      expect(sim.summary.day!.temperature.meanK).toBeCloseTo(published, 2);
      expect(sim.summary.night!.temperature).toEqual({ minK: 0, maxK: 0, meanK: 0, swingK: 0 });
      expect(sim.summary.night!.wienPeakAtMaxM).toBeNull();
      expect(sim.series.states[1]!.temperatureK.every((t) => t === 0)).toBe(true);
      // A uniform dayside is still an energy budget: half the sphere absorbs and emits, the other nothing.
      if (weighting === "uniform") expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
    }
    // An internal flux alone warms the night side to (q/σ)^¼ (common practice): no longer dark.
    const warmed = simulate({ ...withExchange(nominalCase({ e: 0, heatCapacity: 1e7 }), 0, "uniform"), surface: { ...nominalCase({}).surface, heatCapacityJPerM2K: 1e7, internalFluxWPerM2: 2 } }, { samples: 0 });
    expect(warmed.summary.night!.temperature.meanK).toBeCloseTo((2 / STEFAN_BOLTZMANN) ** 0.25, 6);
  });

  it("puts both sides at the global temperature when ε = 1", () => {
    const base = nominalCase({ e: 0.3, heatCapacity: 5e7, albedo: 0.3 });
    const global = simulate(base, { samples: 0 });
    const dn = simulate(withExchange(base, 1, "uniform"), { samples: 0 });
    for (const side of [dn.summary.day!, dn.summary.night!]) {
      expect(side.temperature.minK).toBeCloseTo(global.summary.temperature.minK, 5);
      expect(side.temperature.maxK).toBeCloseTo(global.summary.temperature.maxK, 5);
    }
  });

  for (const [what, eps, k] of [["a recirculation efficiency", 0.4, 0], ["an exchange coefficient", 0, 2.5]] as const) {
    it(`conserves energy over both hemispheres with ${what} on an eccentric orbit (uniform dayside)`, () => {
      const sim = simulate(withExchange(nominalCase({ e: 0.3, heatCapacity: 3e7 }), eps, "uniform", k), { samples: 0 });
      expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
      // Total absorbed over the two hemispheres is the whole-body (f = 1/4) value (common practice).
      const global = simulate(nominalCase({ e: 0.3, heatCapacity: 3e7 }), { samples: 0 });
      expect(sim.summary.meanAbsorbedWPerM2! / global.summary.meanAbsorbedWPerM2!).toBeCloseTo(1, 9);
    });
  }

  it("solves the exchange-coefficient equilibrium exactly (both balance equations hold)", () => {
    const balance = new DayNightBalance(orbit, surface, SOLAR_LUMINOSITY_W, { recirculation: 0, coefficientWPerM2K: 3, weighting: "uniform" });
    const out = new Float64Array(2);
    balance.equilibrium(0, out);
    const [td, tn] = [out[0]!, out[1]!];
    const h = 3 * (td - tn);
    expect(Math.abs(s / 2 - STEFAN_BOLTZMANN * td ** 4 - h) / s).toBeLessThan(1e-12);
    expect(Math.abs(h - STEFAN_BOLTZMANN * tn ** 4) / s).toBeLessThan(1e-12);
  });
});

describe("the day/night equilibrium's iteration cap", () => {
  it("raises EQUILIBRIUM_NO_CONVERGENCE, saying which balance, when Newton's method reaches its cap", () => {
    const out = new Float64Array(2);
    // Uniform dayside (L = 4 f_d − 1 = 1), k = 3 W m⁻² K⁻¹: the default cap converges and both equations hold.
    exchangeEquilibrium(680, 0, STEFAN_BOLTZMANN, 1, 3, out);
    const h = 3 * (out[0]! - out[1]!);
    expect(Math.abs(680 - STEFAN_BOLTZMANN * out[0]! ** 4 - h) / 680).toBeLessThan(1e-12);
    expect(Math.abs(h - STEFAN_BOLTZMANN * out[1]! ** 4) / 680).toBeLessThan(1e-12);
    // Started from a nearby equilibrium (what the balance does between neighbouring calls), the same root.
    const warm = new Float64Array(2);
    exchangeEquilibrium(680, 0, STEFAN_BOLTZMANN, 1, 3, warm, undefined, [out[0]! * 1.01, out[1]! * 0.98]);
    expect(Math.abs(warm[0]! / out[0]! - 1)).toBeLessThan(1e-13);
    expect(Math.abs(warm[1]! / out[1]! - 1)).toBeLessThan(1e-13);
    // One step from the mixed start cannot meet the 1e-13 criterion: a typed error, not a silent guess.
    expect(() => exchangeEquilibrium(680, 0, STEFAN_BOLTZMANN, 1, 3, out, 1)).toThrowError(
      expect.objectContaining({ code: "EQUILIBRIUM_NO_CONVERGENCE", message: expect.stringMatching(/^the day\/night equilibrium with an exchange coefficient did not converge in 1 Newton steps/) }),
    );
  });
});

describe("daily-mean insolation and latitude bands", () => {
  // Berger 1978, J. Atmos. Sci. 35, 2362 (formula from memory); values derived with S₀ = 1361 W m⁻², r = a.
  const cases: Array<[string, number, number, number]> = [
    ["the equator at equinox", 0, 0, 433.22],
    ["45° at equinox", 45, 0, 306.33],
    ["45° at δ = 23.44°", 45, 23.44, 499.32],
    ["the pole at δ = 23.44°", 90, 23.44, 541.39],
    ["60° at δ = −23.44°", 60, -23.44, 23.59],
  ];
  for (const [where, lat, decl, expected] of cases) {
    it(`gives ${expected} W m⁻² at ${where}`, () => {
      expect(dailyMeanInsolation(1361, lat * deg, decl * deg)).toBeCloseTo(expected, 2);
    });
  }
  it("is zero in polar night", () => {
    expect(dailyMeanInsolation(1361, 80 * deg, -23.44 * deg)).toBe(0);
    expect(dailyMeanInsolation(1361, -90 * deg, 10 * deg)).toBe(0);
  });

  it("gives the pole an annual mean of S₀ sin θ / π through the band model (derived from the daily-mean formula)", () => {
    // At the pole Q = S₀ sin δ in polar day and 0 in polar night; over a circular year
    // ⟨max(0, sin θ sin λ)⟩ = sin θ / π. For θ = 23.44°, S₀ = 1361.17: 172.35 W m⁻² (the familiar
    // ≈ 173 W m⁻² of polar climatology, common practice).
    const theta = 23.44 * deg;
    const thermal: ThermalCase = {
      ...nominalCase({ e: 0, heatCapacity: 2e8 }),
      regime: "band",
      location: { latitudeRad: 90 * deg, longitudeRad: 0 },
      spin: { rateRadPerSecond: 7.29e-5, obliquityRad: theta, equinoxTrueAnomalyRad: 0 },
    };
    const sim = simulate(thermal, { samples: 0 });
    const s0 = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    expect(Math.abs(sim.summary.meanAbsorbedWPerM2! / ((s0 * Math.sin(theta)) / Math.PI) - 1)).toBeLessThan(1e-6);
    expect(sim.summary.meanAbsorbedWPerM2).toBeCloseTo(172.35, 1);
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
  });
});

describe("surface points on a spinning body", () => {
  const locked = (lonDeg: number, q = 0): ThermalCase => ({
    ...nominalCase({ e: 0, heatCapacity: 1e6, internalFlux: q }),
    regime: "point",
    location: { latitudeRad: 0, longitudeRad: lonDeg * deg },
    spin: { rateRadPerSecond: (2 * Math.PI) / YEAR, ratio: { spin: 1, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
  });

  it("puts the substellar point of a locked circular orbit at the substellar regime's temperature", () => {
    const point = simulate(locked(0), { samples: 0 });
    const substellar = simulate({ ...nominalCase({ e: 0, heatCapacity: 1e6 }), regime: "substellar" }, { samples: 0 });
    expect(point.summary.solarDaySeconds).toBeNull();
    expect(Math.abs(point.summary.temperature.meanK / substellar.summary.temperature.meanK - 1)).toBeLessThan(1e-8);
  });

  it("cools the antistellar point of a locked body to the internal-heat equilibrium (q/εσ)^(1/4)", () => {
    const q = 0.08;
    const sim = simulate(locked(180, q), { samples: 0 });
    expect(Math.abs(sim.summary.temperature.meanK / equilibriumTemperature(q, 1) - 1)).toBeLessThan(1e-8);
  });

  it("refuses a point in permanent night with no internal heat", () => {
    expect(() => simulate(locked(180), { samples: 0 })).toThrowError(/never sees the star/);
  });

  it("gives a 3:2 resonance a solar day of exactly two orbits", () => {
    // 1/P_solar = 1/P_spin − 1/P_orbit = (3/2 − 1)/P ⇒ P_solar = 2P, from the spin and orbital rates alone.
    expect(solarDaySeconds((1.5 * 2 * Math.PI) / YEAR, (2 * Math.PI) / YEAR, 0)! / YEAR).toBeCloseTo(2, 12);
    const sim = simulate(
      {
        ...nominalCase({ e: 0.2, heatCapacity: 1e6, aAu: 0.4, periodSeconds: YEAR * 0.4 ** 1.5 }),
        regime: "point",
        location: { latitudeRad: 0, longitudeRad: 0 },
        spin: { rateRadPerSecond: (1.5 * 2 * Math.PI) / (YEAR * 0.4 ** 1.5), ratio: { spin: 3, orbit: 2 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
      },
      { samples: 0 },
    );
    expect(sim.summary.solarDaySeconds! / sim.summary.periodSeconds).toBeCloseTo(2, 12);
    expect(sim.summary.cycleSeconds / sim.summary.periodSeconds).toBeCloseTo(2, 9);
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
  });

  it("holds a fast-spinning point (500 solar days per orbit) to 1e-8 against the odex package's extrapolation integrator", () => {
    // Every sunrise and sunset is a corner in the forcing; the tolerance must still hold over them all.
    const fast: ThermalCase = {
      ...nominalCase({ e: 0.1, heatCapacity: 1e6, albedo: 0.1, emissivity: 0.95 }),
      regime: "point",
      location: { latitudeRad: 20 * deg, longitudeRad: 0 },
      spin: { rateRadPerSecond: (501 * 2 * Math.PI) / YEAR, ratio: { spin: 501, orbit: 1 }, obliquityRad: 10 * deg, equinoxTrueAnomalyRad: 0 },
    };
    const ours = simulate(fast, { samples: 0 });
    const reference = simulate(fast, { samples: 0, integrator: "odex" });
    expect(ours.solver.integrator).toBe("dormand-prince");
    for (const key of ["minK", "maxK", "meanK"] as const) {
      expect(Math.abs(ours.summary.temperature[key] / reference.summary.temperature[key] - 1)).toBeLessThan(1e-8);
    }
    // Mean absorbed = mean emitted at the periodic state (energy conservation), through 500 sunrises.
    expect(Math.abs(ours.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
  });

  it("follows a thin skin through sunrise on a 3:2 resonance to 1e-8 of the odex package's result", () => {
    // C = 2.8e4 J m⁻² K⁻¹ (2 cm of regolith): the night cools to ~30 K and sunrise is a sharp corner.
    const skin: ThermalCase = {
      ...nominalCase({ e: 0.21, heatCapacity: 2.8e4, albedo: 0.12, emissivity: 0.94, aAu: 0.36, periodSeconds: YEAR * 0.36 ** 1.5 }),
      regime: "point",
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: (1.5 * 2 * Math.PI) / (YEAR * 0.36 ** 1.5), ratio: { spin: 3, orbit: 2 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
    };
    const ours = simulate(skin, { samples: 0 });
    const reference = simulate(skin, { samples: 0, integrator: "odex", relativeTolerance: 1e-11 });
    expect(ours.summary.temperature.minK).toBeLessThan(60);
    for (const key of ["minK", "maxK", "meanK"] as const) {
      expect(Math.abs(ours.summary.temperature[key] / reference.summary.temperature[key] - 1)).toBeLessThan(1e-8);
    }
  });

  it("librates the substellar longitude of a locked orbit by about 2e (equation of the centre; Murray & Dermott 1999, §2.5, from memory)", () => {
    for (const e of [0.01, 0.05]) {
      const n = (2 * Math.PI) / YEAR;
      let amplitude = 0;
      for (let k = 0; k < 2000; k++) {
        const t = (YEAR * k) / 2000;
        const nu = trueAnomalyFromEccentric(eccentricAnomaly(n * t, e), e);
        amplitude = Math.max(amplitude, Math.abs(substellarLongitude(n, t, nu)));
      }
      // ν − M = 2e sin M + (5/4) e² sin 2M + O(e³): the maximum is 2e to first order.
      expect(Math.abs(amplitude / (2 * e) - 1)).toBeLessThan(2 * e);
    }
  });
});

describe("retrograde spins (obliquity above 90°)", () => {
  const DAY = 86_400;

  it("gives a Venus-like spin its 116.75-day solar day (NASA planetary fact sheet, from memory)", () => {
    // Sidereal rotation 243.02 d retrograde, written as a prograde spin at obliquity 177.4°; orbit
    // 224.70 d; published solar day 116.75 d (fact-sheet values, from memory). The solar day is
    // 2π/|Ω − sgn(cos θ) n| = 1/(1/243.02 + 1/224.70) d.
    const spin = (2 * Math.PI) / (243.02 * DAY);
    const n = (2 * Math.PI) / (224.7 * DAY);
    expect(Math.abs(solarDaySeconds(spin, n, 177.4 * deg)! / DAY - 116.75)).toBeLessThan(0.005);
    // The same spin about the unflipped axis would be the prograde 2957-day day.
    expect(solarDaySeconds(spin, n, 2.6 * deg)! / DAY).toBeGreaterThan(2900);
    const venusLike: ThermalCase = {
      ...nominalCase({ e: 0.0068, aAu: 0.723, periodSeconds: 224.7 * DAY, heatCapacity: 1e6 }),
      regime: "point",
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: spin, obliquityRad: 177.4 * deg, equinoxTrueAnomalyRad: 0 },
    };
    expect(Math.abs(buildThermalModel(venusLike).solarDaySeconds! / DAY - 116.75)).toBeLessThan(0.005);
  });

  it("gives a 1:1 spin at obliquity 180° two solar days per orbit, not a synchronous label", () => {
    const n = (2 * Math.PI) / YEAR;
    expect(solarDaySeconds(n, n, Math.PI)! / YEAR).toBeCloseTo(0.5, 12);
    expect(solarDaySeconds(n, n, 0)).toBeNull();
    const flipped: ThermalCase = {
      ...nominalCase({ e: 0, heatCapacity: 1e6, albedo: 0.1 }),
      regime: "point",
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: n, ratio: { spin: 1, orbit: 1 }, obliquityRad: Math.PI, equinoxTrueAnomalyRad: 0 },
    };
    const sim = simulate(flipped, { samples: 0 });
    expect(sim.summary.solarDaySeconds! / YEAR).toBeCloseTo(0.5, 12);
    // The absorbed flux was already right: on a circular orbit the equator's mean is (1 − A) S/π,
    // the daily-mean insolation of the equator with the star in its plane (Berger 1978, from memory).
    const s0 = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    expect(Math.abs(sim.summary.meanAbsorbedWPerM2! / ((0.9 * s0) / Math.PI) - 1)).toBeLessThan(1e-6);
    // And with two solar days per orbit it is the same point as a prograde 3:1 spin (solar rate 2n both).
    const prograde = simulate({ ...flipped, spin: { rateRadPerSecond: 3 * n, ratio: { spin: 3, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 } }, { samples: 0 });
    for (const key of ["minK", "maxK", "meanK"] as const) {
      expect(Math.abs(sim.summary.temperature[key] / prograde.summary.temperature[key] - 1)).toBeLessThan(1e-8);
    }
  });
});

describe("hour angle and zenith (the geometry the point forcing uses)", () => {
  it("puts the star at zenith distance |φ − δ| at noon and on the horizon at Berger's sunrise hour angle", () => {
    // Spherical astronomy (common practice): at H = 0, z = |φ − δ|; cos h₀ = −tan φ tan δ is where cos z = 0.
    for (const [lat, decl] of [[0, 0], [40, 23.44], [-35, 10], [70, -20]] as const) {
      expect(cosZenith(lat * deg, decl * deg, 0)).toBeCloseTo(Math.cos((lat - decl) * deg), 14);
      const h0 = Math.acos(-Math.tan(lat * deg) * Math.tan(decl * deg));
      expect(Math.abs(cosZenith(lat * deg, decl * deg, h0))).toBeLessThan(1e-14);
    }
  });

  it("gives the same cos z from the sines and cosines of the star's longitude and the point's angle as from δ, α and H", () => {
    // The star at ecliptic longitude l is at (cos l, cos θ sin l, sin θ sin l) in the equatorial frame
    // (spherical astronomy, common practice); H = A − α with tan α = cos θ tan l.
    for (const [lat, theta, l, a] of [[40, 23.44, 75, 10], [-35, 97, 200, -130], [70, 0, 300, 400], [0, 180, 45, 45], [89, 60, 181, 3]] as const) {
      const sinL = Math.sin(l * deg);
      const cosL = Math.cos(l * deg);
      const decl = Math.asin(Math.sin(theta * deg) * sinL);
      const alpha = stellarRightAscension(theta * deg, l * deg, 0);
      const fromAngles = cosZenithFromAngles(Math.sin(lat * deg), Math.cos(lat * deg), Math.sin(theta * deg), Math.cos(theta * deg), sinL, cosL, Math.sin(a * deg), Math.cos(a * deg));
      expect(fromAngles).toBeCloseTo(cosZenith(lat * deg, decl, a * deg - alpha), 13);
    }
  });

  it("averages cos z over a day to Berger's daily-mean insolation (Berger 1978, formula from memory)", () => {
    for (const [lat, decl] of [[45, 23.44], [60, -23.44], [10, 5]] as const) {
      let sum = 0;
      const steps = 100_000;
      for (let j = 0; j < steps; j++) sum += Math.max(0, cosZenith(lat * deg, decl * deg, (2 * Math.PI * (j + 0.5)) / steps - Math.PI));
      expect(Math.abs((1361 * sum) / steps - dailyMeanInsolation(1361, lat * deg, decl * deg))).toBeLessThan(1e-6);
    }
  });

  it("turns the hour angle with the spin and back with the star: H = λ + Ω t − ν at zero obliquity, 0 at the substellar longitude", () => {
    const spin = { rateRadPerSecond: 3e-6, obliquityRad: 0, equinoxTrueAnomalyRad: 0.7 };
    expect(hourAngle(spin, 0.3, 1e5, 1.1)).toBeCloseTo(0.3 + 0.3 - 1.1, 12);
    expect(hourAngle(spin, substellarLongitude(3e-6, 1e5, 1.1), 1e5, 1.1)).toBeCloseTo(0, 12);
    // With obliquity the star's right ascension runs unevenly (tan α = cos θ tan l), and H follows it.
    const tilted = { ...spin, obliquityRad: 23.44 * deg };
    const alpha = (nu: number) => stellarRightAscension(tilted.obliquityRad, nu, tilted.equinoxTrueAnomalyRad);
    expect(hourAngle(tilted, 0.3, 1e5, 1.1)).toBeCloseTo(0.3 + alpha(0) + 0.3 - alpha(1.1), 12);
  });

  it("gives a fast-spinning point the orbit-mean insolation of its latitude band (point geometry against Berger's daily means)", () => {
    // 2000 solar days per orbit: the day is short enough that the point's mean over the orbit is the
    // mean of Berger's daily means to about the day's share of the declination change.
    const orbit = nominalCase({ e: 0.2 }).orbit;
    const n = (2 * Math.PI) / orbit.periodSeconds;
    for (const [lat, obliquity] of [[40, 23.44], [-65, 40], [0, 120]] as const) {
      const spin = { rateRadPerSecond: 2001 * n, obliquityRad: obliquity * deg, equinoxTrueAnomalyRad: 0.5 };
      const point = pointForcing(0.3, SOLAR_LUMINOSITY_W, orbit, lat * deg, 0, spin, 1).meanAbsorbedWPerM2;
      const band = bandForcing(0.3, SOLAR_LUMINOSITY_W, orbit, lat * deg, obliquity * deg, 0.5).meanAbsorbedWPerM2;
      expect(Math.abs(point / band - 1)).toBeLessThan(1e-3);
    }
  });
});
