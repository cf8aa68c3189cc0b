import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, DAY_S, SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN } from "../src/constants.js";
import { LumpedBalance } from "../src/physics/energyBalance.js";
import { equilibriumTemperature, GEOMETRY_FACTOR, stellarFlux } from "../src/physics/flux.js";
import { lumpedForcing, type Forcing } from "../src/physics/forcing.js";
import type { Orbit } from "../src/physics/orbit.js";
import { integrateCycle } from "../src/solve/periodic.js";
import { simulate } from "../src/run/simulate.js";
import { nominalCase } from "./helpers.js";

const noSunlight: Forcing = { absorbedAt: () => 0, meanAbsorbedWPerM2: 0 };

describe("radiative cooling with no input", () => {
  // Exact solution of C dT/dt = −εσT⁴: T(t) = T₀ (1 + 3εσT₀³ t / C)^(−1/3) (derived);
  // T₀ = 300 K, C = 1e5 J m⁻² K⁻¹, ε = 1 → 285.082 K (1 h), 175.813 K (1 d), 87.226 K (10 d).
  const period = 10 * DAY_S;
  const orbit: Orbit = { semiMajorAxisM: 1e11, eccentricity: 0, periodSeconds: period, meanAnomalyAtStartRad: 0 };
  const balance = new LumpedBalance(orbit, { albedo: 0, emissivity: 1, heatCapacityJPerM2K: 1e5, internalFluxWPerM2: 0 }, noSunlight);
  const exact = (t: number) => 300 * (1 + (3 * STEFAN_BOLTZMANN * 300 ** 3 * t) / 1e5) ** (-1 / 3);
  for (const integrator of ["dormand-prince", "odex", "radau"] as const) {
    it(`matches the closed form to 1e-8 relative with ${integrator}`, () => {
      const toAnomaly = (t: number) => (2 * Math.PI * t) / period; // circular: E = M = n t
      const xs = Float64Array.of(toAnomaly(3600), toAnomaly(DAY_S), toAnomaly(10 * DAY_S));
      const ys = new Float64Array(3);
      const y = Float64Array.of(300);
      integrateCycle(balance, integrator, 0, 2 * Math.PI, y, 1e-11, Float64Array.of(300), { xs, ys, components: 1 });
      const times = [3600, DAY_S, 10 * DAY_S];
      times.forEach((t, i) => expect(Math.abs(ys[i]! / exact(t) - 1)).toBeLessThan(1e-8));
      expect(ys[0]).toBeCloseTo(285.082, 3);
      expect(ys[1]).toBeCloseTo(175.813, 3);
      expect(ys[2]).toBeCloseTo(87.226, 3);
    });
  }
});

describe("periodic steady state", () => {
  it("stays at T_eq on a circular orbit", () => {
    const sim = simulate(nominalCase({ e: 0, albedo: 0.3, emissivity: 0.9 }), { samples: 50 });
    const teq = equilibriumTemperature(0.25 * 0.7 * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M), 0.9);
    for (const t of sim.series.temperatureK) expect(Math.abs(t / teq - 1)).toBeLessThan(1e-8);
    expect(sim.summary.lagSeconds).toBeNull();
    expect(sim.summary.dampingRatio).toBe(1);
  });

  // First-order linear system driven at frequency ω (standard): amplitude ratio 1/√(1+(ωτ)²),
  // lag arctan(ωτ)/ω, τ = C/(4εσT³). On an orbit with small e the flux is F̄(1 + 2e cos M + O(e²)),
  // so ΔS/S = 2e; e = 1e-5 keeps the neglected terms near 1e-5 relative.
  for (const tauOverPeriod of [0.05, 0.3, 2]) {
    it(`follows the linear response for τ/P = ${tauOverPeriod} to 1e-4 relative`, () => {
      const period = 3.15576e7;
      const s = GEOMETRY_FACTOR.global * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
      const tMean = equilibriumTemperature(s, 1);
      const heatCapacity = tauOverPeriod * period * 4 * STEFAN_BOLTZMANN * tMean ** 3;
      const sim = simulate(nominalCase({ e: 1e-5, heatCapacity, periodSeconds: period }), { samples: 0, relativeTolerance: 1e-12 });
      const omegaTau = 2 * Math.PI * tauOverPeriod;
      expect(Math.abs(sim.summary.dampingRatio! * Math.sqrt(1 + omegaTau ** 2) - 1)).toBeLessThan(1e-4);
      const lag = (Math.atan(omegaTau) / (2 * Math.PI)) * period;
      expect(Math.abs(sim.summary.lagSeconds! / lag - 1)).toBeLessThan(1e-4);
    });
  }

  it("balances mean absorbed and mean emitted power to 1e-8 over random scenarios (property)", () => {
    fc.assert(
      fc.property(
        fc.double({ min: 0, max: 0.95, noNaN: true }),
        fc.double({ min: 3, max: 11, noNaN: true }),
        fc.double({ min: 0, max: 0.9, noNaN: true }),
        fc.double({ min: 0.3, max: 1, noNaN: true }),
        fc.double({ min: 0.2, max: 5, noNaN: true }),
        fc.double({ min: 0, max: 2 * Math.PI, noNaN: true }),
        (e, log10C, albedo, emissivity, aAu, m0) => {
          const sim = simulate(
            nominalCase({ e, heatCapacity: 10 ** log10C, albedo, emissivity, aAu, periodSeconds: 3.15576e7 * aAu ** 1.5, meanAnomalyAtStartRad: m0 }),
            { samples: 0 },
          );
          return Math.abs(sim.summary.energyBalanceResidual!) <= 1e-8;
        },
      ),
      { numRuns: 60, seed: 20261201 },
    );
  });

  it("closes a spinning point's budget and mean at small heat capacity: the statistics grid resolves the climb after each sunrise", () => {
    // 20 solar days per orbit (a 21:1 spin), e = 0.1; τ = 9e-4 P at C = 1e5 and 9e-5 P at C = 1e4.
    // The grid once had about 2 points per τ: residual 1.6e-6 at C = 1e5, mean 6.4e-6 off at C = 1e4.
    const n = (2 * Math.PI) / 3.15576e7;
    for (const heatCapacity of [1e4, 1e5]) {
      const sim = simulate(
        {
          ...nominalCase({ e: 0.1, heatCapacity, albedo: 0.1, emissivity: 0.95, internalFlux: 0.03, regime: "point" }),
          location: { latitudeRad: 0, longitudeRad: 0 },
          spin: { rateRadPerSecond: 21 * n, ratio: { spin: 21, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
        },
        { samples: 100_001 },
      );
      // A periodic state emits what it absorbs (common practice), to about the tolerance (1e-8).
      expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(2e-8);
      // Its mean against the trapezoidal time mean of the dense series (uniform in time, ~90 points per τ), which
      // shares no quadrature with the statistics grid.
      const temps = sim.series.temperatureK;
      let sum = 0;
      for (let k = 0; k + 1 < temps.length; k++) sum += 0.5 * (temps[k]! + temps[k + 1]!);
      const seriesMeanK = sum / (temps.length - 1);
      expect(Math.abs(sim.summary.temperature.meanK / seriesMeanK - 1)).toBeLessThan(1e-8);
    }
  });

  it("converges as fast for τ = 100 P as for τ = P (Newton on the one-orbit map)", () => {
    const tMean = equilibriumTemperature(GEOMETRY_FACTOR.global * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M) * 1.1547, 1);
    const cFor = (tauOverP: number) => tauOverP * 3.15576e7 * 4 * STEFAN_BOLTZMANN * tMean ** 3;
    const slow = simulate(nominalCase({ e: 0.5, heatCapacity: cFor(100) }), { samples: 0 });
    const fast = simulate(nominalCase({ e: 0.5, heatCapacity: cFor(1) }), { samples: 0 });
    expect(slow.summary.tauOverPeriod).toBeGreaterThan(90);
    expect(slow.solver.iterations).toBeLessThanOrEqual(fast.solver.iterations + 1);
    expect(Math.abs(slow.summary.energyBalanceResidual!)).toBeLessThan(1e-8);
  });

  it("measures the lag from periastron whatever the starting phase", () => {
    const atPeriastron = simulate(nominalCase({ e: 0.4, heatCapacity: 5e7 }), { samples: 0 });
    const later = simulate(nominalCase({ e: 0.4, heatCapacity: 5e7, meanAnomalyAtStartRad: 2.5 }), { samples: 0 });
    expect(later.summary.lagSeconds! / atPeriastron.summary.lagSeconds! - 1).toBeLessThan(1e-7);
    expect(later.summary.temperature.maxK).toBeCloseTo(atPeriastron.summary.temperature.maxK, 6);
  });

  it("agrees between Dormand–Prince, the odex package (an independent extrapolation code) and Radau IIA to 1e-9 over an eccentric orbit", () => {
    // All three integrate the same balance from the same start through one orbit, sampled densely.
    const thermal = nominalCase({ e: 0.6, heatCapacity: 3e5 });
    const forcing = lumpedForcing("global", 0, SOLAR_LUMINOSITY_W, thermal.orbit);
    const balance = new LumpedBalance(thermal.orbit, thermal.surface, forcing);
    const xs = Float64Array.from({ length: 101 }, (_, k) => (2 * Math.PI * k) / 100);
    const results = (["odex", "dormand-prince", "radau"] as const).map((integrator) => {
      const ys = new Float64Array(xs.length);
      integrateCycle(balance, integrator, 0, 2 * Math.PI, Float64Array.of(250), 1e-11, Float64Array.of(300), { xs, ys, components: 1 });
      return ys;
    });
    for (const other of [results[1]!, results[2]!]) {
      for (let k = 0; k < xs.length; k++) expect(Math.abs(other[k]! / results[0]![k]! - 1)).toBeLessThan(1e-9);
    }
  });

  it("finds the same periodic state with the odex package as with the default integrator, to 1e-8", () => {
    const thermal = nominalCase({ e: 0.5, heatCapacity: 5e7 });
    const ours = simulate(thermal, { samples: 0 });
    const reference = simulate(thermal, { samples: 0, integrator: "odex" });
    expect(ours.solver.integrator).toBe("dormand-prince");
    expect(reference.solver.integrator).toBe("odex");
    for (const key of ["minK", "maxK", "meanK"] as const) {
      expect(Math.abs(ours.summary.temperature[key] / reference.summary.temperature[key] - 1)).toBeLessThan(1e-8);
    }
    expect(Math.abs(ours.summary.lagSeconds! / reference.summary.lagSeconds! - 1)).toBeLessThan(1e-6);
  });

  it("switches to the implicit integrator when the radiative time is a small fraction of the orbit", () => {
    expect(simulate(nominalCase({ e: 0.3, heatCapacity: 1e4 }), { samples: 0 }).solver.integrator).toBe("radau");
    expect(simulate(nominalCase({ e: 0.3, heatCapacity: 1e8 }), { samples: 0 }).solver.integrator).toBe("dormand-prince");
  });

  it("relaxes a cold start toward the periodic state in transient mode", () => {
    const thermal = nominalCase({ e: 0.3, heatCapacity: 2e7 });
    const periodic = simulate(thermal, { samples: 0 });
    const spinUp = simulate(thermal, { samples: 10, transient: { startK: 100, orbits: 20 } });
    expect(spinUp.solver.mode).toBe("transient");
    expect(spinUp.series.temperatureK[0]).toBe(100);
    expect(spinUp.summary.temperature.meanK).toBeCloseTo(periodic.summary.temperature.meanK, 3);
  });
});

describe("time in a temperature window", () => {
  it("equals the time the equilibrium spends in the window when the heat capacity is tiny (Kepler's equation)", () => {
    // With τ/P ~ 1e-7, T = T_eq(r) to ~1e-6 K, and T_eq ∈ [lo, hi] ⇔ r ∈ [r(hi), r(lo)]; the time
    // between those distances follows from r = a(1 − e cos E) and M = E − e sin E (common practice).
    const e = 0.5;
    const thermal = nominalCase({ e, heatCapacity: 3, windowK: [250, 300] });
    const sim = simulate(thermal, { samples: 0 });
    const s0 = GEOMETRY_FACTOR.global * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    // T_eq = T_a (a/r)^(1/2) with T_a the equilibrium at r = a.
    const tA = equilibriumTemperature(s0, 1);
    const rOver = (T: number) => (tA / T) ** 2; // r/a at which T_eq = T
    const anomaly = (rOverA: number) => Math.acos(Math.min(1, Math.max(-1, (1 - rOverA) / e)));
    const meanAt = (E: number) => E - e * Math.sin(E);
    const e1 = anomaly(rOver(300)); // inner edge (hotter)
    const e2 = anomaly(rOver(250));
    const expectedFraction = (2 * (meanAt(e2) - meanAt(e1))) / (2 * Math.PI);
    expect(Math.abs(sim.summary.timeInRange!.fraction - expectedFraction)).toBeLessThan(1e-6);
  });
});
