import { describe, expect, it } from "vitest";
import { STEFAN_BOLTZMANN } from "../src/constants.js";
import { buildColumnGrid, DEFAULT_GRID, skinDepthM } from "../src/physics/column.js";
import { solveColumnPeriodic, solveSurface, type ColumnProblem } from "../src/solve/columnSolver.js";
import { CalorbitError } from "../src/errors.js";
import { simulate } from "../src/run/simulate.js";
import { homogeneous, nominalCase } from "./helpers.js";

/** A half-space under F(t) = F₀(1 + a cos ωt), one period per cycle, time = E/ω. */
function halfSpace(amplitude: number, stepsPerCycle: number, topFraction = 0.02, growth = 1.08) {
  const period = 86_400;
  const props = homogeneous(0.01, 1500, 800);
  const delta = skinDepthM(0.01, 1500, 800, period);
  const grid = buildColumnGrid(props, delta, delta, { ...DEFAULT_GRID, topLayerFraction: topFraction, growth, depthInSkinDepths: 12, maxLayers: 400 });
  const f0 = 300;
  const problem: ColumnProblem = {
    properties: props,
    grid,
    emissivity: 1,
    interiorFluxWPerM2: 0,
    absorbedAt: (E) => f0 * (1 + amplitude * Math.cos(E)),
    timeAt: (E) => (E / (2 * Math.PI)) * period,
    startE: 0,
    cycleLength: 2 * Math.PI,
    stepsPerCycle,
    initialK: (f0 / STEFAN_BOLTZMANN) ** 0.25,
    shortSkinDepthM: delta,
  };
  return { problem, result: solveColumnPeriodic(problem, 1e-9), delta, grid };
}

/** First Fourier coefficient (amplitude, phase) of a sampled periodic series over one cycle. */
function harmonic(values: ArrayLike<number>, count: number): { amplitude: number; phase: number } {
  let a = 0;
  let b = 0;
  for (let k = 0; k < count; k++) {
    const w = (2 * Math.PI * k) / count;
    a += values[k]! * Math.cos(w);
    b += values[k]! * Math.sin(w);
  }
  return { amplitude: (2 * Math.hypot(a, b)) / count, phase: Math.atan2(b, a) };
}

describe("conduction column", () => {
  it("damps the wave by e⁻¹ and delays it by one radian at one skin depth (Carslaw & Jaeger 1959, §2.6)", () => {
    const { result, delta, grid } = halfSpace(0.01, 960);
    const n = grid.thicknessM.length;
    const steps = result.stepE.length - 1;
    // Interpolate the layer temperatures to z = δ at every step.
    let i = 0;
    while (grid.centreM[i + 1]! < delta) i++;
    const f = (delta - grid.centreM[i]!) / (grid.centreM[i + 1]! - grid.centreM[i]!);
    const atDelta = Float64Array.from({ length: steps }, (_, k) => (1 - f) * result.layerK[k * n + i]! + f * result.layerK[k * n + i + 1]!);
    const surface = harmonic(result.surfaceK, steps);
    const deep = harmonic(atDelta, steps);
    expect(Math.abs(deep.amplitude / surface.amplitude / Math.exp(-1) - 1)).toBeLessThan(0.01);
    const lagDeg = ((deep.phase - surface.phase) * 180) / Math.PI;
    expect(Math.abs(lagDeg - 180 / Math.PI)).toBeLessThan(1);
  });

  it("answers a small periodic flux with the linearised half-space surface response (Carslaw & Jaeger; linear radiation)", () => {
    // T_s amplitude = ΔF / |4εσT³ + I√(iω)| and the surface temperature lags the flux by
    // arg(4εσT³ + I√ω e^{iπ/4}), with I = √(kρc) (standard linear theory).
    const { result } = halfSpace(0.01, 960);
    const steps = result.stepE.length - 1;
    const t0 = (300 / STEFAN_BOLTZMANN) ** 0.25;
    const h = 4 * STEFAN_BOLTZMANN * t0 ** 3;
    const inertia = Math.sqrt(0.01 * 1500 * 800);
    const omega = (2 * Math.PI) / 86_400;
    const re = h + inertia * Math.sqrt(omega) * Math.SQRT1_2;
    const im = inertia * Math.sqrt(omega) * Math.SQRT1_2;
    const surface = harmonic(result.surfaceK, steps);
    expect(Math.abs(surface.amplitude / (3 / Math.hypot(re, im)) - 1)).toBeLessThan(0.01);
    expect(Math.abs(surface.phase - Math.atan2(im, re))).toBeLessThan((1 * Math.PI) / 180);
  });

  it("balances absorbed against emitted plus what crosses the bottom over a periodic cycle, to 1e-6", () => {
    const { result } = halfSpace(0.5, 480);
    expect(Math.abs(result.energyBalanceResidual)).toBeLessThan(1e-6);
    expect(result.periodicityResidual).toBeLessThan(1e-9);
  });

  it("converges at second order in time (Crank–Nicolson) and in space (finite volumes)", () => {
    // The surface temperature at the cycle's start, as the steps halve on a fine grid, and as
    // uniform layers halve with fine steps: successive changes should fall about 4×.
    const atStart = (steps: number, top: number, growth: number) => halfSpace(0.5, steps, top, growth).result.surfaceK[0]!;
    const time = [120, 240, 480].map((st) => atStart(st, 0.02, 1.05));
    const timeOrder = Math.log2(Math.abs(time[1]! - time[0]!) / Math.abs(time[2]! - time[1]!));
    const space = [0.2, 0.1, 0.05].map((top) => atStart(2000, top, 1));
    const spaceOrder = Math.log2(Math.abs(space[1]! - space[0]!) / Math.abs(space[2]! - space[1]!));
    expect(timeOrder).toBeGreaterThan(1.8);
    expect(timeOrder).toBeLessThan(2.3);
    expect(spaceOrder).toBeGreaterThan(1.8);
    expect(spaceOrder).toBeLessThan(2.3);
    // With the default controls (480 steps per period, top layer 5 % of δ) the surface is within 0.02 K of the finest level here.
    expect(Math.abs(atStart(480, 0.05, 1.15) - space[2]!)).toBeLessThan(0.02);
  });

  it("reproduces the lumped model when the column is thin and highly conductive", () => {
    const base = nominalCase({ e: 0.3, heatCapacity: 2700 * 897 * 0.5 });
    const lumped = simulate(base, { samples: 0 });
    const col = simulate(
      {
        ...base,
        column: {
          properties: homogeneous(2000, 2700, 897),
          grid: { ...DEFAULT_GRID, totalDepthM: 0.5, stepsPerShortestPeriod: 2000 },
          outputDepthsM: [],
          interiorFluxWPerM2: 0,
        },
      },
      { relativeTolerance: 1e-8 },
    );
    expect(Math.abs(col.summary.temperature.maxK - lumped.summary.temperature.maxK)).toBeLessThan(0.01);
    expect(Math.abs(col.summary.temperature.minK - lumped.summary.temperature.minK)).toBeLessThan(0.01);
    expect(Math.abs(col.summary.temperature.meanK - lumped.summary.temperature.meanK)).toBeLessThan(0.01);
  });
});

describe("an airless regolith against published lunar temperatures", () => {
  it("gives the lunar equator's noon, pre-dawn and diurnal-mean temperatures (Diviner: ≈ 390 K, ≈ 95 K and ≈ 213 K; Vasavada et al. 2012, JGR 117, E00H18, and Hayne et al. 2017, from memory)", () => {
    // Regolith parameters of Hayne et al. 2017 (JGR Planets 122, 2371; abstract and appendix, from
    // memory): ρ 1100 → 1800 kg m⁻³ and k_c 7.4e-4 → 3.4e-3 W m⁻¹ K⁻¹ on H = 0.07 m, χ = 2.7,
    // c(T) = −3.6125 + 2.7431 T + 2.3616e-3 T² − 1.2340e-5 T³ + 8.9093e-9 T⁴; A₀ = 0.12 rising with
    // incidence as A(θ) = A₀ + 0.06 (θ/45°)³ + 0.25 (θ/90°)⁸, ε = 0.95; interior heat flow 0.018 W m⁻²
    // (from memory). The orbit is circular at 1 au with a period of 12 synodic months so that a 13:1
    // spin gives the 29.53-day solar day exactly.
    const synodicMonth = 29.530589 * 86_400;
    const base = nominalCase({ e: 0, albedo: 0.12, emissivity: 0.95, periodSeconds: 12 * synodicMonth });
    const thermal = {
      ...base,
      surface: { ...base.surface, albedoIncidence: { a: 0.06, b: 0.25 } },
      regime: "point" as const,
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: (13 * 2 * Math.PI) / (12 * synodicMonth), ratio: { spin: 13, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
    };
    const sim = simulate({
      ...thermal,
      column: {
      properties: {
        densitySurface: 1100,
        densityDeep: 1800,
        conductivitySurface: 7.4e-4,
        conductivityDeep: 3.4e-3,
        eFoldingDepthM: 0.07,
        specificHeatPolynomial: [-3.6125, 2.7431, 2.3616e-3, -1.234e-5, 8.9093e-9],
        radiativeChi: 2.7,
      },
      grid: DEFAULT_GRID,
      outputDepthsM: [],
      interiorFluxWPerM2: 0.018,
      },
    });
    expect(sim.summary.solarDaySeconds! / synodicMonth).toBeCloseTo(1, 9);
    expect(Math.abs(sim.summary.temperature.maxK - 390)).toBeLessThan(6);
    expect(Math.abs(sim.summary.temperature.minK - 95)).toBeLessThan(8);
    // The diurnal mean: 210.3 K here against the observed ≈ 213 K (Diviner equatorial mean, from
    // memory); with a constant albedo of 0.12 the same column gives 217.5 K, 4.5 K too warm,
    // because grazing morning and evening light is then absorbed as if it came from overhead.
    expect(Math.abs(sim.summary.temperature.meanK - 213)).toBeLessThan(3.5);
    expect(Math.abs(sim.summary.energyBalanceResidual!)).toBeLessThan(1e-5);
    // The profile: the daily wave is gone a few skin depths down (Hayne et al. 2017: ≈ 250 K below ~0.5 m, from memory).
    const deep = sim.summary.depthProfile!.at(-1)!;
    expect(deep.maxK - deep.minK).toBeLessThan(1);
    expect(Math.abs(deep.meanK - 250)).toBeLessThan(20);
  });
});

describe("a column under a retrograde spin", () => {
  it("sizes its grid and steps from the retrograde solar day: a 17:16 spin at obliquity 180° equals a 49:16 spin at 0°", () => {
    // On a circular orbit a spin Ω about the flipped axis (θ = 180°) sees the star move at Ω + n, a
    // prograde spin at 0° at Ω − n (common practice): 17/16 + 1 = 49/16 − 1 = 33/16 of n, so both
    // points have the same forcing, the same 33 solar days per 16-orbit cycle, and must give the same column.
    const P = 3.15576e7;
    const n = (2 * Math.PI) / P;
    const base = { ...nominalCase({ e: 0, albedo: 0.1 }), regime: "point" as const, location: { latitudeRad: 0.3, longitudeRad: 0 } };
    const column = {
      properties: homogeneous(0.01, 1500, 800),
      grid: { ...DEFAULT_GRID, stepsPerShortestPeriod: 64, depthInSkinDepths: 2 },
      outputDepthsM: [],
      interiorFluxWPerM2: 0.05,
    };
    const run = (spinRatio: number, obliquityRad: number) =>
      simulate({ ...base, column, spin: { rateRadPerSecond: (spinRatio / 16) * n, ratio: { spin: spinRatio, orbit: 16 }, obliquityRad, equinoxTrueAnomalyRad: 0 } });
    const retrograde = run(17, Math.PI);
    const prograde = run(49, 0);
    expect(retrograde.summary.solarDaySeconds! / P).toBeCloseTo(16 / 33, 12);
    expect(prograde.summary.solarDaySeconds! / P).toBeCloseTo(16 / 33, 12);
    expect(retrograde.solver.stepsPerCycle).toBe(prograde.solver.stepsPerCycle);
    expect(retrograde.solver.layers).toBe(prograde.solver.layers);
    expect(retrograde.summary.skinDepths!.diurnalM).toBeCloseTo(prograde.summary.skinDepths!.diurnalM!, 12);
    for (const key of ["minK", "maxK", "meanK"] as const) {
      expect(Math.abs(retrograde.summary.temperature[key] / prograde.summary.temperature[key] - 1)).toBeLessThan(1e-9);
    }
  });
});

describe("the column's iteration caps", () => {
  it("raises PERIODIC_NO_CONVERGENCE, saying what did not converge, when the cycle cap is reached", () => {
    const { problem } = halfSpace(0.5, 120);
    let caught: unknown;
    try {
      solveColumnPeriodic({ ...problem, maxCycles: 1 }, 1e-9);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CalorbitError);
    expect((caught as CalorbitError).code).toBe("PERIODIC_NO_CONVERGENCE");
    expect((caught as CalorbitError).message).toMatch(/^the column did not reach a periodic state in 1 cycle\(s\) \(periodicity .*, energy residual .*; tolerance 1\.00e-9\)$/);
    // The same problem with the default cap converges (the cap, not the problem, stopped it).
    expect(solveColumnPeriodic(problem, 1e-9).cycles).toBeGreaterThan(1);
  });

  it("solves the surface balance to Stefan–Boltzmann's equilibrium and raises EQUILIBRIUM_NO_CONVERGENCE at its cap", () => {
    // With no conductance the balance is F = εσT⁴: T = (F/(εσ))^(1/4) (Stefan–Boltzmann law, CODATA 2018 σ).
    const f = 1361;
    expect(Math.abs(solveSurface(f, 200, 50, 0.9 * STEFAN_BOLTZMANN, 0) / (f / (0.9 * STEFAN_BOLTZMANN)) ** 0.25 - 1)).toBeLessThan(1e-12);
    // With a conductance G the result satisfies F − εσT⁴ − G (T − T₀) = 0.
    const t = solveSurface(f, 200, 50, STEFAN_BOLTZMANN, 3);
    expect(Math.abs(f - STEFAN_BOLTZMANN * t ** 4 - 3 * (t - 200)) / f).toBeLessThan(1e-12);
    expect(() => solveSurface(f, 200, 5, STEFAN_BOLTZMANN, 3, 3)).toThrowError(
      expect.objectContaining({ code: "EQUILIBRIUM_NO_CONVERGENCE", message: expect.stringMatching(/^the column's surface balance at the cycle's start did not converge in 3 Newton steps/) }),
    );
  });
});

describe("the column's minimum at sunrise, between fixed steps", () => {
  it("extrapolates the night branch to the sunrise found on the forcing (a parabola through three steps is exact for a quadratic branch: Lagrange interpolation, common practice)", async () => {
    const { sunriseMinimum } = await import("../src/run/columnCycle.js");
    const steps = 200;
    const stepE = Float64Array.from({ length: steps + 1 }, (_, k) => (2 * Math.PI * k) / steps);
    const sunrise = 2.0123; // between two steps
    const sunset = 4.5;
    const lit = (E: number) => E > sunrise && E < sunset;
    // Night: cooling along a parabola that reaches 90 K at sunrise; day: a steep rise from it.
    const temperature = (E: number) => (E <= sunrise ? 90 + 0.3 * (sunrise - E) + 0.05 * (sunrise - E) ** 2 : E < sunset ? 90 + 40 * (E - sunrise) : 200 - 5 * (E - sunset));
    const surfaceK = Float64Array.from(stepE, temperature);
    const found = sunriseMinimum(stepE, surfaceK, (E) => (lit(E) ? 1 : 0))!;
    expect(Math.abs(found.E - sunrise)).toBeLessThan(1e-12);
    expect(Math.abs(found.K - 90)).toBeLessThan(1e-10);
    // The lowest step lies above it: the sampled minimum alone would miss the end of the night.
    expect(Math.min(...surfaceK) - 90).toBeGreaterThan(1e-4);
    expect(sunriseMinimum(stepE, surfaceK, () => 0)).toBeNull();
  });
});
