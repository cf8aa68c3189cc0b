/**
 * The zonal climate (latitude bands, meridional diffusion, ice–albedo feedback) against published
 * limits and analytic solutions; sources beside each check.
 */
import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN, ZERO_CELSIUS_K } from "../src/constants.js";
import { CalorbitError } from "../src/errors.js";
import { albedoLaw, legendreP2, northStepAlbedo, type AlbedoSpec } from "../src/physics/climateAlbedo.js";
import { applyDiffusion, bandGrid, meridionalDiffusion } from "../src/physics/climateBands.js";
import { heatCapacityLaw, spiegelSurface, type HeatCapacitySpec } from "../src/physics/climateHeatCapacity.js";
import { zonalInsolation } from "../src/physics/climateInsolation.js";
import { greyOpticalDepth, NORTH_LINEAR, type OutgoingSpec } from "../src/physics/climateOutgoing.js";
import type { ClimateSettings } from "../src/physics/climateSettings.js";
import { stellarFlux } from "../src/physics/flux.js";
import { dailyMeanInsolation } from "../src/physics/geometry.js";
import { simulateZonal, type ZonalCase } from "../src/run/zonal.js";
import { simulate } from "../src/run/simulate.js";
import { solveZonalPeriodic } from "../src/solve/zonalPeriodic.js";
import { ZonalStepper } from "../src/solve/zonalStepper.js";
import { nominalCase } from "./helpers.js";

const deg = Math.PI / 180;
const YEAR = 3.15576e7;

function zonalCase(climate: Partial<ClimateSettings>, over: Partial<ZonalCase> = {}): ZonalCase {
  return {
    luminosityW: SOLAR_LUMINOSITY_W,
    orbit: { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 },
    obliquityRad: 0,
    equinoxTrueAnomalyRad: 0,
    internalFluxWPerM2: 0,
    climate: {
      bands: 30,
      diffusionWPerM2K: 0.649,
      outgoing: { law: "blackbody", emissivity: 1 },
      albedo: { law: "constant", value: 0.3 },
      heatCapacity: { kind: "slab", heatCapacityJPerM2K: 1e8 },
      start: "warm",
      stepsPerOrbit: 96,
      ...climate,
    },
    ...over,
  };
}

// North, Cahalan & Coakley 1981 (Rev. Geophys. 19, 91): annual-mean insolation Q(1 + S₂P₂(x)),
// co-albedo a₀ + a₂P₂(x), I = A + B·T(°C), Q = 334.4 W m⁻² (../shared/REFERENCES.md).
const NORTH = { Q: 334.4, S2: -0.482, a0: 0.697, a2: -0.0779, A: 203.3, B: 2.09, D: 0.649 };

/** ∫ P₂ and ∫ P₄ over [x0, x1] (Legendre polynomials, integrated by hand). */
const intP2 = (x0: number, x1: number): number => 0.5 * (x1 ** 3 - x0 ** 3) - 0.5 * (x1 - x0);
const intP4 = (x0: number, x1: number): number => (7 * (x1 ** 5 - x0 ** 5) - 10 * (x1 ** 3 - x0 ** 3) + 3 * (x1 - x0)) / 8;

/** A time-independent insolation Q(1 + S₂P₂(x)) averaged over each band: the annual-mean forcing of North's analytic solution (a test-only forcing). */
function northInsolation(bands: number, q: number) {
  return {
    at(_E: number, out: Float64Array): void {
      for (let j = 0; j < bands; j++) {
        const x0 = -1 + (2 * j) / bands;
        const x1 = -1 + (2 * (j + 1)) / bands;
        out[j] = q * (1 + (NORTH.S2 * intP2(x0, x1)) / (x1 - x0));
      }
    },
  };
}

function northCase(bands: number, diffusion: number, albedo: AlbedoSpec, q = NORTH.Q, start: ClimateSettings["start"] = "warm"): ZonalCase {
  return zonalCase(
    { bands, diffusionWPerM2K: diffusion, outgoing: NORTH_LINEAR, albedo, heatCapacity: { kind: "slab", heatCapacityJPerM2K: 2e8 }, start, stepsPerOrbit: 48 },
    { insolation: northInsolation(bands, q) },
  );
}

describe("North's linear energy-balance model (analytic)", () => {
  // North 1975 (J. Atmos. Sci. 32, 1301): each Legendre mode of the forcing responds as
  // T_n = F_n/(n(n+1)D + B). With F = Q(1 + S₂P₂)(a₀ + a₂P₂) − A and P₂² = 1/5 + (2/7)P₂ + (18/35)P₄:
  const F0 = NORTH.Q * (NORTH.a0 + (NORTH.S2 * NORTH.a2) / 5) - NORTH.A;
  const F2 = NORTH.Q * (NORTH.a0 * NORTH.S2 + NORTH.a2 + (2 / 7) * NORTH.S2 * NORTH.a2);
  const F4 = NORTH.Q * NORTH.S2 * NORTH.a2 * (18 / 35);
  const modes = (d: number) => [F0 / NORTH.B, F2 / (6 * d + NORTH.B), F4 / (20 * d + NORTH.B)] as const;
  const profileC = (d: number, x: number): number => {
    const [t0, t2, t4] = modes(d);
    return t0 + t2 * legendreP2(x) + t4 * ((35 * x ** 4 - 30 * x * x + 3) / 8);
  };

  it("gives the computed ice-free profile of ../shared/REFERENCES.md (15.45 °C mean; 26.87, 18.14, 1.38, −6.65 °C at 0°, 30°, 60°, 90° for D = 0.649; 48.86, −45.96 for D = 0)", () => {
    expect(modes(NORTH.D)[0]).toBeCloseTo(15.45, 2);
    expect(profileC(NORTH.D, 0)).toBeCloseTo(26.87, 2);
    expect(profileC(NORTH.D, Math.sin(30 * deg))).toBeCloseTo(18.14, 2);
    expect(profileC(NORTH.D, Math.sin(60 * deg))).toBeCloseTo(1.38, 2);
    expect(profileC(NORTH.D, 1)).toBeCloseTo(-6.65, 2);
    expect(profileC(0, 0)).toBeCloseTo(48.86, 2);
    expect(profileC(0, 1)).toBeCloseTo(-45.96, 2);
  });

  for (const d of [NORTH.D, 0.2, 2]) {
    it(`reproduces the band means of the analytic profile to 0.05 K with 90 bands (D = ${d} W m⁻² K⁻¹)`, () => {
      const bands = 90;
      const albedo: AlbedoSpec = { law: "constant", value: 1 - NORTH.a0, p2: -NORTH.a2 };
      const sim = simulateZonal(northCase(bands, d, albedo));
      const [t0, t2, t4] = modes(d);
      let worst = 0;
      sim.climates[0]!.summary.bands.forEach((band, j) => {
        const x0 = -1 + (2 * j) / bands;
        const x1 = x0 + 2 / bands;
        const exactC = t0 + (t2 * intP2(x0, x1) + t4 * intP4(x0, x1)) / (x1 - x0);
        worst = Math.max(worst, Math.abs(band.temperature.meanK - ZERO_CELSIUS_K - exactC));
      });
      expect(worst).toBeLessThan(0.05);
      expect(Math.abs(sim.climates[0]!.summary.globalMeanK - ZERO_CELSIUS_K - t0)).toBeLessThan(0.01);
    });
  }
});

describe("ice–albedo feedback with North's parameters", () => {
  // North 1975 and North, Cahalan & Coakley 1981: with ice (co-albedo 0.38) below −10 °C, today's
  // forcing holds both an ice-free climate and a snowball (from memory: the published figure of
  // the ice edge against Q has both branches at Q = 334.4 W m⁻²).
  const north = northStepAlbedo();
  it("keeps an ice-free warm start and a snowball cold start at Q = 334.4 W m⁻²", () => {
    const sim = simulateZonal(northCase(90, NORTH.D, north, NORTH.Q, "both"));
    expect(sim.startsAgree).toBe(false);
    const [warm, cold] = sim.climates;
    expect(warm!.start).toBe("warm");
    expect(warm!.summary.iceEdge!.minDeg).toBe(90);
    expect(warm!.summary.snowball).toBe(false);
    expect(cold!.start).toBe("cold");
    expect(cold!.summary.snowball).toBe(true);
    expect(cold!.summary.iceEdge!.maxDeg).toBeCloseTo(0, 6);
    // The snowball's analytic global mean: (0.38 Q − A)/B = −36.47 °C (constant co-albedo, mode 0).
    expect(cold!.summary.globalMeanK - ZERO_CELSIUS_K).toBeCloseTo((0.38 * NORTH.Q - NORTH.A) / NORTH.B, 2);
    for (const c of [warm!, cold!]) expect(c.solver.monodromyRadius).toBeLessThan(1);
  });

  it("moves the warm branch's ice edge poleward as the luminosity rises", () => {
    const edges = [0.93, 0.94, 0.95, 0.96].map((f) => {
      const c = simulateZonal(northCase(90, NORTH.D, north, NORTH.Q * f, "warm")).climates[0]!;
      expect(c.summary.snowball).toBe(false);
      return c.summary.iceEdge!.meanDeg;
    });
    for (let i = 1; i < edges.length; i++) expect(edges[i]!).toBeGreaterThan(edges[i - 1]! + 0.5);
    expect(edges[0]!).toBeGreaterThan(30);
    expect(edges.at(-1)!).toBeLessThan(90);
  });
});

describe("limits of the transport", () => {
  const obliquity = 23.44 * deg;
  it("with D = 0 gives each band the temperature of the band regime at its latitude", () => {
    // Each band then solves the band regime's equation, C dT/dt = (1 − A)Q_daily − εσT⁴, on its own
    // (calorbit's band regime: Dormand–Prince to 1e-8). A zonal band averages the insolation over its
    // width where the band regime takes the centre: with 360 bands (0.3°–5° wide) that leaves ≤ 1.5e-3 K
    // (measured to fall as 1/N² from 90 bands), and 240 steps of the second-order stepper less.
    const sim = simulateZonal(
      zonalCase({ bands: 360, diffusionWPerM2K: 0, stepsPerOrbit: 240 }, { obliquityRad: obliquity, orbit: { ...zonalCase({}).orbit, eccentricity: 0.1 } }),
    );
    const bands = sim.climates[0]!.summary.bands;
    for (const j of [180, 240, 300, 344]) {
      const band = bands[j]!;
      const reference = simulate(
        {
          ...nominalCase({ e: 0.1, periodSeconds: YEAR, albedo: 0.3, heatCapacity: 1e8, regime: "band" }),
          spin: { rateRadPerSecond: 1e-4, obliquityRad: obliquity, equinoxTrueAnomalyRad: 0 },
          location: { latitudeRad: band.latitudeDeg * deg, longitudeRad: 0 },
        },
        { samples: 0 },
      ).summary;
      expect(Math.abs(band.temperature.meanK - reference.temperature.meanK)).toBeLessThan(0.005);
      expect(Math.abs(band.temperature.maxK - reference.temperature.maxK)).toBeLessThan(0.005);
      expect(Math.abs(band.temperature.minK - reference.temperature.minK)).toBeLessThan(0.005);
    }
  });

  it("with D → ∞ gives every band the global slab temperature", () => {
    // All bands then share one temperature: the global regime's C dT/dt = (1 − A)S/4 − εσT⁴.
    const sim = simulateZonal(zonalCase({ bands: 30, diffusionWPerM2K: 1e6, stepsPerOrbit: 720 }, { obliquityRad: obliquity, orbit: { ...zonalCase({}).orbit, eccentricity: 0.3 } }));
    const reference = simulate(nominalCase({ e: 0.3, periodSeconds: YEAR, albedo: 0.3, heatCapacity: 1e8, regime: "global" }), { samples: 0 }).summary;
    const summary = sim.climates[0]!.summary;
    expect(Math.abs(summary.globalMeanK - reference.temperature.meanK)).toBeLessThan(0.01);
    expect(Math.abs(summary.temperature.maxK - reference.temperature.maxK)).toBeLessThan(0.02);
    expect(Math.abs(summary.temperature.minK - reference.temperature.minK)).toBeLessThan(0.02);
    for (const band of summary.bands) expect(Math.abs(band.temperature.meanK - reference.temperature.meanK)).toBeLessThan(0.01);
    expect(Math.abs(summary.equatorPoleContrastK)).toBeLessThan(0.01);
  });
});

describe("a linear climate's time mean", () => {
  it("solves the steady diffusion equation forced by the time-mean insolation (linear outgoing radiation, constant albedo)", () => {
    // With I = A + B(T − 273.15 K) and a fixed albedo the band system is linear, so averaging it over a
    // periodic orbit leaves the steady balance (1 − α)⟨Q⟩ − A − B(⟨T⟩ − 273.15 K) + transport(⟨T⟩) = 0
    // (linearity alone; the steady system is solved here by dense elimination, independently of the stepper).
    const bands = 24;
    const c = zonalCase(
      { bands, outgoing: NORTH_LINEAR, albedo: { law: "constant", value: 0.3, p2: 0.05 }, heatCapacity: { kind: "slab", heatCapacityJPerM2K: 4e7 }, stepsPerOrbit: 720 },
      { obliquityRad: 50 * deg, equinoxTrueAnomalyRad: 0.8, orbit: { ...zonalCase({}).orbit, eccentricity: 0.35 } },
    );
    const means = simulateZonal(c).climates[0]!.summary.bands.map((b) => b.temperature.meanK);
    // ⟨Q⟩ by the trapezoidal rule in E weighted by dt/dE, on 20,000 points (independent of the stepper).
    const grid = bandGrid(bands);
    const insolation = zonalInsolation(grid, { luminosityW: c.luminosityW, orbit: c.orbit, obliquityRad: c.obliquityRad, equinoxTrueAnomalyRad: c.equinoxTrueAnomalyRad });
    const meanQ = new Float64Array(bands);
    const row = new Float64Array(bands);
    const points = 20_000;
    let weight = 0;
    for (let k = 0; k < points; k++) {
      const E = (2 * Math.PI * k) / points;
      const w = 1 - 0.35 * Math.cos(E);
      insolation.at(E, row);
      for (let j = 0; j < bands; j++) meanQ[j]! += w * row[j]!;
      weight += w;
    }
    // The steady tridiagonal system (B + k_{j−1} + k_j) T_j − k_{j−1}T_{j−1} − k_j T_{j+1} = (1 − α_j)⟨Q_j⟩ − A + 273.15 B, by dense elimination.
    const k = meridionalDiffusion(grid, 0.649).coupling;
    const m = Array.from({ length: bands }, () => new Float64Array(bands + 1));
    for (let j = 0; j < bands; j++) {
      const alpha = 0.3 + 0.05 * legendreP2(grid.centreX[j]!);
      m[j]![j] = NORTH.B + (j > 0 ? k[j - 1]! : 0) + (j < bands - 1 ? k[j]! : 0);
      if (j > 0) m[j]![j - 1] = -k[j - 1]!;
      if (j < bands - 1) m[j]![j + 1] = -k[j]!;
      m[j]![bands] = (1 - alpha) * (meanQ[j]! / weight) - NORTH.A + ZERO_CELSIUS_K * NORTH.B;
    }
    for (let col = 0; col < bands; col++) {
      for (let r = col + 1; r < bands; r++) {
        const f = m[r]![col]! / m[col]![col]!;
        for (let cc = col; cc <= bands; cc++) m[r]![cc]! -= f * m[col]![cc]!;
      }
    }
    const steady = new Float64Array(bands);
    for (let r = bands - 1; r >= 0; r--) {
      let s = m[r]![bands]!;
      for (let cc = r + 1; cc < bands; cc++) s -= m[r]![cc]! * steady[cc]!;
      steady[r] = s / m[r]![r]!;
    }
    let worst = 0;
    for (let j = 0; j < bands; j++) worst = Math.max(worst, Math.abs(means[j]! - steady[j]!));
    expect(worst).toBeLessThan(0.01);
  });
});

describe("energy and time stepping", () => {
  const oblique = { obliquityRad: 40 * deg, equinoxTrueAnomalyRad: 1, orbit: { semiMajorAxisM: 1.05 * ASTRONOMICAL_UNIT_M, eccentricity: 0.4, periodSeconds: YEAR, meanAnomalyAtStartRad: 0.7 } };
  const icy: Partial<ClimateSettings> = {
    bands: 60,
    diffusionWPerM2K: 0.5394,
    outgoing: { law: "grey" },
    albedo: { law: "smooth" },
    heatCapacity: spiegelSurface(0.7),
    start: "both",
    stepsPerOrbit: 180,
  };
  it("closes the globe's energy budget at the periodic state to < 1e-8, warm and cold (eccentric, oblique, ice, freezing ocean)", () => {
    // An invariant: over one periodic orbit the stored heat returns, so absorbed = emitted.
    const sim = simulateZonal(zonalCase(icy, oblique));
    expect(sim.climates.length).toBeGreaterThan(0);
    for (const c of sim.climates) {
      expect(Math.abs(c.summary.energyBalanceResidual)).toBeLessThan(1e-8);
      expect(c.summary.meanAbsorbedWPerM2).toBeGreaterThan(0);
    }
  });

  it("converges at second order in the time step (an L-stable SDIRK2)", () => {
    // Alexander 1977 (SIAM J. Numer. Anal. 14, 1006): order 2. Halving the step quarters the error
    // of the periodic state (against a run at 16× the finest step).
    const run = (steps: number) => simulateZonal(zonalCase({ bands: 12, stepsPerOrbit: steps, heatCapacity: { kind: "slab", heatCapacityJPerM2K: 2e7 } }, { ...oblique })).climates[0]!.summary;
    const reference = run(1920);
    const error = (steps: number) => Math.max(...run(steps).bands.map((b, j) => Math.abs(b.temperature.meanK - reference.bands[j]!.temperature.meanK)));
    const e60 = error(60);
    const e120 = error(120);
    expect(e60 / e120).toBeGreaterThan(3.2);
    expect(e60 / e120).toBeLessThan(5);
  });

  it("stores heat H(T) = ∫C dT for Spiegel et al.'s freezing ocean: dH/dT = C off the kinks, H continuous at 263 K and 273 K", () => {
    const law = heatCapacityLaw(spiegelSurface(0.7));
    for (const t of [200, 250, 262.9, 263.1, 265, 268, 272.99, 273.01, 290]) {
      const h = 1e-4;
      expect(Math.abs((law.heat(t + h) - law.heat(t - h)) / (2 * h) / law.capacity(t) - 1)).toBeLessThan(1e-6);
    }
    for (const kink of [263, 273]) {
      // A jump in H would stay as ε → 0; a continuous H changes by at most 2ε max C.
      const eps = 1e-6;
      const bound = 2 * eps * Math.max(law.capacity(kink - eps), law.capacity(kink + eps));
      expect(Math.abs(law.heat(kink + eps) - law.heat(kink - eps))).toBeLessThan(1.001 * bound);
    }
    // Spiegel et al. 2008 (from memory): 9.2 C_l of ice just below freezing, 2 C_l below 263 K, the ocean 40 C_l.
    const land = heatCapacityLaw(spiegelSurface(0));
    const ocean = heatCapacityLaw(spiegelSurface(1));
    expect(ocean.capacity(280) / land.capacity(280)).toBeCloseTo(40, 12);
    const open = Math.exp((150 - 273) / 10); // the unfrozen share f = exp((T − 273 K)/10 K)
    expect(ocean.capacity(150) / land.capacity(150)).toBeCloseTo(2 * (1 - open) + 40 * open, 12);
  });
});

describe("grey greenhouse", () => {
  // Spiegel, Menou & Scharf 2008: I = σT⁴/(1 + 0.75 τ_IR). A one-band planet in equilibrium then sits
  // above its blackbody temperature by (1 + 0.75 τ_IR)^(1/4); with 0.75 τ = 1 that is the one-layer
  // greenhouse, T_s = 2^(1/4) T_e (Marshall & Plumb 2008, §2.3.1).
  const steady = (outgoing: OutgoingSpec) =>
    simulateZonal(zonalCase({ bands: 1, outgoing, heatCapacity: { kind: "slab", heatCapacityJPerM2K: 1e7 }, stepsPerOrbit: 48 })).climates[0]!.summary;
  const blackbodyK = (absorbed: number) => Math.sqrt(Math.sqrt(absorbed / STEFAN_BOLTZMANN));

  it("a one-band globe absorbs (1 − A)S/4 (the band-mean daily insolation over the whole sphere)", () => {
    const s = steady({ law: "blackbody", emissivity: 1 });
    expect(Math.abs(s.meanAbsorbedWPerM2 / ((0.7 * stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M)) / 4) - 1)).toBeLessThan(1e-4);
  });

  it("warms by 2^(1/4) with 0.75 τ = 1 (Marshall & Plumb's one-layer atmosphere)", () => {
    const s = steady({ law: "grey", opticalDepth: 4 / 3 });
    expect(Math.abs(s.globalMeanK / blackbodyK(s.meanAbsorbedWPerM2) - 2 ** 0.25)).toBeLessThan(1e-9);
  });

  it("warms by (1 + 0.75 τ_IR)^(1/4) with τ_IR = 0.79 (T/273 K)³ at the planet's own temperature", () => {
    const s = steady({ law: "grey" });
    const tau = greyOpticalDepth({}, s.globalMeanK);
    expect(tau).toBeGreaterThan(0.5);
    expect(Math.abs(s.globalMeanK / blackbodyK(s.meanAbsorbedWPerM2) - (1 + 0.75 * tau) ** 0.25)).toBeLessThan(1e-9);
  });
});

describe("band grid, transport and insolation", () => {
  it("conserves heat: the transport sums to zero over the globe, with no flux through the poles", () => {
    const grid = bandGrid(37);
    const diffusion = meridionalDiffusion(grid, 0.649);
    const t = Float64Array.from(grid.centreX, (x) => 250 + 40 * Math.cos(3 * x) + 7 * x);
    const out = new Float64Array(37);
    applyDiffusion(diffusion, t, out);
    const total = out.reduce((s, v, j) => s + v * grid.areaFraction[j]!, 0);
    expect(Math.abs(total)).toBeLessThan(1e-12);
    expect(grid.areaFraction.reduce((s, w) => s + w, 0)).toBeCloseTo(1, 14);
  });

  it("averages Berger's daily-mean insolation over each band (against a 4000-point midpoint rule in x)", () => {
    // Berger 1978 (../shared/REFERENCES.md) at the equinox: the equator receives S/π.
    const orbit = { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: 0.2, periodSeconds: YEAR, meanAnomalyAtStartRad: 0 };
    const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    const fine = zonalInsolation(bandGrid(1000), { luminosityW: SOLAR_LUMINOSITY_W, orbit: { ...orbit, eccentricity: 0 }, obliquityRad: 23.44 * deg, equinoxTrueAnomalyRad: 0 });
    const equinox = new Float64Array(1000);
    fine.at(0, equinox);
    expect(Math.abs((equinox[499]! + equinox[500]!) / 2 / (s / Math.PI) - 1)).toBeLessThan(1e-5);

    const grid = bandGrid(18);
    const insolation = zonalInsolation(grid, { luminosityW: SOLAR_LUMINOSITY_W, orbit, obliquityRad: 35 * deg, equinoxTrueAnomalyRad: 0.4 });
    const out = new Float64Array(18);
    for (const E of [0.3, 1.9, 4]) {
      insolation.at(E, out);
      const r = 1 - 0.2 * Math.cos(E);
      const nu = 2 * Math.atan(Math.sqrt(1.2 / 0.8) * Math.tan(E / 2));
      const decl = Math.asin(Math.sin(35 * deg) * Math.sin(nu - 0.4));
      for (let j = 0; j < 18; j++) {
        let sum = 0;
        const m = 4000;
        for (let k = 0; k < m; k++) {
          const x = grid.edgeX[j]! + ((k + 0.5) / m) * (grid.edgeX[j + 1]! - grid.edgeX[j]!);
          sum += dailyMeanInsolation(s / (r * r), Math.asin(x), decl) / m;
        }
        // Design accuracy 3e-4 of S/π (≈ 0.03 K): two-point Gauss pieces lose their order at the
        // polar-night edge, where the daily mean has a kink inside a band.
        expect(Math.abs(out[j]! - sum)).toBeLessThan(3e-4 * (s / Math.PI));
      }
    }
  });
});

describe("honest failures", () => {
  it("raises PERIODIC_NO_CONVERGENCE, not a state, when the orbits allowed cannot settle the climate", () => {
    const c = zonalCase({ bands: 20 });
    const grid = bandGrid(20);
    const law = albedoLaw({ law: "constant", value: 0.3 });
    const system = {
      grid,
      diffusion: meridionalDiffusion(grid, 0.649),
      albedo: Array.from(grid.centreX, (x) => law.forBand(x)),
      outgoing: { spec: NORTH_LINEAR, flux: (t: number) => STEFAN_BOLTZMANN * t ** 4, slope: (t: number) => 4 * STEFAN_BOLTZMANN * t ** 3 },
      heatCapacity: heatCapacityLaw({ kind: "slab", heatCapacityJPerM2K: 1e10 } satisfies HeatCapacitySpec),
      internalFluxWPerM2: 0,
      insolation: zonalInsolation(grid, { luminosityW: c.luminosityW, orbit: c.orbit, obliquityRad: 0, equinoxTrueAnomalyRad: 0 }),
      eccentricity: 0,
      meanMotionRadPerSecond: (2 * Math.PI) / YEAR,
      startE: 0,
    };
    const attempt = () =>
      solveZonalPeriodic(new ZonalStepper(system), new Float64Array(20).fill(320), () => undefined, { stepsPerOrbit: 48, maxOrbits: 1, maxSpinUpOrbits: 1 });
    expect(attempt).toThrow(CalorbitError);
    try {
      attempt();
    } catch (error) {
      expect((error as CalorbitError).code).toBe("PERIODIC_NO_CONVERGENCE");
    }
  });

  it("refuses bad settings with the field named", () => {
    expect(() => simulateZonal(zonalCase({ bands: 0 }))).toThrow(/climate\.bands/);
    expect(() => simulateZonal(zonalCase({ diffusionWPerM2K: -1 }))).toThrow(/climate\.diffusion/);
    expect(() => simulateZonal(zonalCase({ albedo: { law: "step", warm: 0.3, ice: 1.2, iceK: 263.15, rampK: 1 } }))).toThrow(/climate\.albedo\.ice/);
  });
});
