/**
 * The map regime and what a telescope sees: the surface grid, the observer's geometry and
 * the passband, each against a published formula or an independent computation.
 */
import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, DAY_S, JUPITER_EQUATORIAL_RADIUS_M, SOLAR_LUMINOSITY_W, SOLAR_MASS_PARAMETER, SOLAR_RADIUS_M, STEFAN_BOLTZMANN } from "../src/constants.js";
import { phaseCurve, phaseCurveSummary } from "../src/analysis/phaseCurve.js";
import { eccentricAnomaly, trueAnomalyFromEccentric } from "../src/physics/kepler.js";
import { conjunctionTimes, coveredFraction, skyOffset, type Observer } from "../src/physics/observer.js";
import { keplerPeriodSeconds } from "../src/physics/orbit.js";
import { BandRadiance, bandRadianceDirect, planckRadiance } from "../src/physics/planck.js";
import { simulateMap, type MapCase } from "../src/run/simulateMap.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { simulate } from "../src/run/simulate.js";

const DEG = Math.PI / 180;
const sunTemperature = (SOLAR_LUMINOSITY_W / (4 * Math.PI * SOLAR_RADIUS_M ** 2 * STEFAN_BOLTZMANN)) ** 0.25;

function mapCase(options: { e?: number; heatCapacity?: number; longitudes?: number; latitudes?: number; spin?: number; aAu?: number }): MapCase {
  const a = (options.aAu ?? 0.05) * ASTRONOMICAL_UNIT_M;
  const period = keplerPeriodSeconds(a, SOLAR_MASS_PARAMETER);
  const p = options.spin ?? 1;
  return {
    orbit: { semiMajorAxisM: a, eccentricity: options.e ?? 0, periodSeconds: period, meanAnomalyAtStartRad: 0 },
    luminosityW: SOLAR_LUMINOSITY_W,
    albedo: 0.1,
    emissivity: 1,
    heatCapacityJPerM2K: options.heatCapacity ?? 1e8,
    internalFluxWPerM2: 0,
    spin: { rateRadPerSecond: (2 * Math.PI * p) / period, obliquityRad: 0, equinoxTrueAnomalyRad: 0, ratio: { spin: p, orbit: 1 } },
    windRadPerSecond: 0,
    longitudes: options.longitudes ?? 36,
    latitudes: options.latitudes ?? 18,
  };
}

const edgeOn: Observer = { inclinationRad: 90 * DEG, argumentOfPeriastronRad: 90 * DEG, longitudeOfNodeRad: 0 };
const bolometric = new BandRadiance({ kind: "bolometric" });

/** Largest departure from (2/3)(1 − A)(R_p/a)² Φ(α), as a share of its peak. */
function lambertError(longitudes: number, latitudes: number): number {
  const c = mapCase({ longitudes, latitudes });
  const sim = simulateMap(c, { samples: 181 });
  const rp = 1e8;
  const curve = phaseCurve(sim.history, { observer: edgeOn, band: bolometric, planetRadiusM: rp, starRadiusM: SOLAR_RADIUS_M, starTemperatureK: sunTemperature });
  const peak = (2 / 3) * (1 - c.albedo) * (rp / c.orbit.semiMajorAxisM) ** 2;
  let worst = 0;
  for (let s = 0; s < curve.fluxRatio.length; s++) {
    const alpha = curve.phaseAngleRad[s]!;
    const lambert = (Math.sin(alpha) + (Math.PI - alpha) * Math.cos(alpha)) / Math.PI;
    worst = Math.max(worst, Math.abs(curve.planetOnlyFluxRatio[s]! - peak * lambert) / peak);
  }
  return worst;
}

describe("passbands: Planck's law", () => {
  it("gives B_λ(10 µm, 300 K) = 9.924 W m⁻² sr⁻¹ µm⁻¹ (derived from the CODATA 2018 h, c, k)", () => {
    expect(planckRadiance(10e-6, 300) * 1e-6).toBeCloseTo(9.924, 3);
  });

  it("integrates over all wavelengths to σT⁴/π (the Stefan–Boltzmann law; CODATA 2018 σ)", () => {
    const wide = bandRadianceDirect({ kind: "tophat", fromM: 0.2e-6, toM: 2000e-6 }, 300);
    expect(wide / ((STEFAN_BOLTZMANN * 300 ** 4) / Math.PI)).toBeCloseTo(1, 4);
  });

  it("tabulates a band's radiance to 1e-6 of the direct quadrature from 30 K to 6000 K, and inverts it to a brightness temperature", () => {
    const band = new BandRadiance({ kind: "tophat", fromM: 7.5e-6, toM: 9.5e-6 });
    for (const t of [30, 77.7, 150, 299.9, 1234.5, 2500, 6000]) {
      const direct = bandRadianceDirect(band.band, t);
      expect(Math.abs(band.at(t) / direct - 1)).toBeLessThan(1e-6);
      expect(band.brightnessTemperature(direct)).toBeCloseTo(t, 4);
    }
  });

  it("fills its table lazily with the same values in any order of use, and a warm-started inversion agrees with a cold one", () => {
    // The table is defined by its grid (each entry the direct quadrature at its own temperature): the
    // order in which temperatures are first asked for cannot change a value.
    const temperatures = [1.5, 40, 299.9, 300.1, 1234.5, 6000, 9.99e4];
    const upward = new BandRadiance({ kind: "tophat", fromM: 3e-6, toM: 12e-6 });
    const downward = new BandRadiance({ kind: "tophat", fromM: 3e-6, toM: 12e-6 });
    const forward = temperatures.map((t) => upward.at(t));
    const backward = [...temperatures].reverse().map((t) => downward.at(t)).reverse();
    expect(backward).toEqual(forward);
    for (const t of [50, 300, 2000]) {
      const radiance = bandRadianceDirect(upward.band, t);
      const cold = upward.brightnessTemperature(radiance);
      for (const guess of [2, t * 0.7, t * 1.3, 9e4]) expect(Math.abs(upward.brightnessTemperature(radiance, guess) / cold - 1)).toBeLessThan(1e-10);
      // d ln B_λ / d ln T = x eˣ/(eˣ − 1) ≥ 1 (x = hc/λkT; Planck's law), so the table's 1e-6 in I is at most 1e-6 in T.
      expect(Math.abs(cold / t - 1)).toBeLessThan(1e-6);
    }
  });
});

describe("the observer's geometry (Winn 2010, 'Transits and Occultations', eqs. 2–4 and 33)", () => {
  it("puts the transit at true anomaly f = 90° − ω, in front of the star, and the occultation at 270° − ω behind it", () => {
    const observer: Observer = { inclinationRad: 90 * DEG, argumentOfPeriastronRad: 40 * DEG, longitudeOfNodeRad: 0 };
    const front = skyOffset(observer, 50 * DEG, 1);
    const back = skyOffset(observer, 230 * DEG, 1);
    expect(front.separationM).toBeLessThan(1e-12);
    expect(front.towardObserverM).toBeCloseTo(1, 12);
    expect(back.separationM).toBeLessThan(1e-12);
    expect(back.towardObserverM).toBeCloseTo(-1, 12);
  });

  it("times the occultation at the conjunction found by scanning Kepler's equation, and matches (P/2)(1 + (4/π) e cos ω) to 1e-4 P at e = 0.05", () => {
    const period = 10 * DAY_S;
    for (const [e, omegaDeg] of [[0.05, 30], [0.5, 100], [0.93, 300]] as const) {
      const orbit = { semiMajorAxisM: 1e10, eccentricity: e, periodSeconds: period, meanAnomalyAtStartRad: 0.3 };
      const observer: Observer = { inclinationRad: 90 * DEG, argumentOfPeriastronRad: omegaDeg * DEG, longitudeOfNodeRad: 0 };
      const { transitSeconds, occultationSeconds } = conjunctionTimes(orbit, observer);
      // independent: X = −r cos(ω + f) changes sign at each conjunction; find the one with Z < 0 by bisection in time
      const sky = (t: number): { x: number; z: number } => {
        const E = eccentricAnomaly(orbit.meanAnomalyAtStartRad + (2 * Math.PI * t) / period, e);
        const f = trueAnomalyFromEccentric(E, e);
        return { x: -Math.cos(observer.argumentOfPeriastronRad + f), z: Math.sin(observer.argumentOfPeriastronRad + f) };
      };
      const crossings: { t: number; z: number }[] = [];
      const steps = 20000;
      for (let k = 0; k < steps; k++) {
        let lo = (period * k) / steps;
        let hi = (period * (k + 1)) / steps;
        if (Math.sign(sky(lo).x) === Math.sign(sky(hi).x)) continue;
        for (let i = 0; i < 60; i++) {
          const mid = 0.5 * (lo + hi);
          if (Math.sign(sky(mid).x) === Math.sign(sky(lo).x)) lo = mid;
          else hi = mid;
        }
        crossings.push({ t: lo, z: sky(lo).z });
      }
      const occultation = crossings.find((c) => c.z < 0)!.t;
      const transit = crossings.find((c) => c.z > 0)!.t;
      expect(Math.abs(occultationSeconds - occultation) / period).toBeLessThan(1e-9);
      expect(Math.abs(transitSeconds - transit) / period).toBeLessThan(1e-9);
      const gap = (((occultationSeconds - transitSeconds) % period) + period) % period;
      const firstOrder = (period / 2) * (1 + (4 / Math.PI) * e * Math.cos(observer.argumentOfPeriastronRad));
      if (e <= 0.05) expect(Math.abs(gap - firstOrder) / period).toBeLessThan(1e-4);
      if (e > 0.9) expect(Math.abs(gap - firstOrder) / period).toBeGreaterThan(0.1); // the formula is first order in e
    }
  });

  it("covers a share (R_p/R★)² of the star when the planet's disc is wholly inside it (uniform discs; common practice)", () => {
    expect(coveredFraction(0.1, 1, 0.5)).toBeCloseTo(0.01, 14);
    expect(coveredFraction(1, 0.1, 0.5)).toBe(1);
    expect(coveredFraction(1, 1, 0)).toBe(1);
    // two equal unit circles a radius apart overlap by 2π/3 − √3/2 (plane geometry)
    expect(coveredFraction(1, 1, 1)).toBeCloseTo((2 * Math.PI) / 3 / Math.PI - Math.sqrt(3) / 2 / Math.PI, 12);
  });
});

describe("map regime: the surface through the orbit", () => {
  it("an instantly re-radiating locked planet on a circular orbit follows the Lambert phase function with the 2/3 dayside (Russell 1916, ApJ 43, 173; Cowan & Agol 2011, ApJ 729, 54) to 1 % of the peak, converging at second order", () => {
    expect(lambertError(36, 18)).toBeLessThan(0.01);
    const coarse = lambertError(12, 6);
    const fine = lambertError(24, 12);
    expect(coarse / fine).toBeGreaterThan(3);
    expect(coarse / fine).toBeLessThan(5);
  });

  it("closes the area-weighted energy budget of an eccentric map to 1e-8", () => {
    const sim = simulateMap(mapCase({ e: 0.4, heatCapacity: 3e6, longitudes: 12, latitudes: 6 }), { relativeTolerance: 1e-8, samples: 50 });
    expect(sim.mode).toBe("periodic");
    expect(Math.abs(sim.energy.residual)).toBeLessThan(1e-8);
  });

  it("reproduces the point regime at each cell centre of a locked eccentric planet (the libration included)", () => {
    const c = mapCase({ e: 0.3, heatCapacity: 3e6, longitudes: 8, latitudes: 4 });
    const sim = simulateMap(c, { relativeTolerance: 1e-8, samples: 101 });
    const cells = c.longitudes * c.latitudes;
    for (const k of [1, 10, 13, 22, 30]) {
      const { thermal } = resolveScenario({
        name: "cell",
        star: { luminosity: `${SOLAR_LUMINOSITY_W} W`, mass: "1 Msun" },
        orbit: { semiMajorAxis: `${c.orbit.semiMajorAxisM} m`, eccentricity: c.orbit.eccentricity, period: `${c.orbit.periodSeconds} s` },
        body: { albedo: c.albedo, emissivity: c.emissivity, heatCapacity: `${c.heatCapacityJPerM2K} J/m2/K` },
        regime: "point",
        spin: { orbitRatio: "1:1" },
        surface: { latitude: `${sim.history.grid.latitudeRad[k]} rad`, longitude: `${sim.history.grid.longitudeRad[k]} rad` },
      });
      const point = simulate(thermal, { samples: 101 });
      for (let s = 0; s < 101; s++) {
        const mapK = sim.history.temperatureK[s * cells + k]!;
        expect(Math.abs(mapK - point.series.temperatureK[s]!) / point.series.temperatureK[s]!).toBeLessThan(1e-6);
      }
    }
  });

  it("averaged round a latitude, a fast rotator's cells reproduce the band regime (daily-mean insolation, Berger 1978) within the diurnal swing's second-order effect", () => {
    const c = mapCase({ e: 0.2, heatCapacity: 2e8, longitudes: 12, latitudes: 6, spin: 20 });
    const sim = simulateMap(c, { samples: 41 });
    const { grid } = sim.history;
    for (const row of [0, 2, 3]) {
      let zonal = 0;
      for (let i = 0; i < grid.longitudes; i++) zonal += sim.cellMeanK[row * grid.longitudes + i]!;
      zonal /= grid.longitudes;
      const { thermal } = resolveScenario({
        name: "band",
        star: { luminosity: `${SOLAR_LUMINOSITY_W} W`, mass: "1 Msun" },
        orbit: { semiMajorAxis: `${c.orbit.semiMajorAxisM} m`, eccentricity: c.orbit.eccentricity, period: `${c.orbit.periodSeconds} s` },
        body: { albedo: c.albedo, emissivity: c.emissivity, heatCapacity: `${c.heatCapacityJPerM2K} J/m2/K` },
        regime: "band",
        spin: { orbitRatio: "20:1" },
        surface: { latitude: `${grid.latitudeRad[row * grid.longitudes]} rad` },
      });
      const band = simulate(thermal, { samples: 0 });
      expect(Math.abs(zonal - band.summary.temperature.meanK)).toBeLessThan(0.5);
    }
  });

  it("puts the phase-curve maximum before the occultation for a prograde rotator with heat capacity on a circular orbit (Cowan & Agol 2011, ApJ 726, 82)", () => {
    const c = mapCase({ e: 0, heatCapacity: 3e6, longitudes: 24, latitudes: 12, spin: 2 });
    const sim = simulateMap(c, { samples: 361 });
    const observer: Observer = { inclinationRad: 88 * DEG, argumentOfPeriastronRad: 0, longitudeOfNodeRad: 0 };
    const curve = phaseCurve(sim.history, { observer, band: bolometric, planetRadiusM: JUPITER_EQUATORIAL_RADIUS_M, starRadiusM: SOLAR_RADIUS_M, starTemperatureK: sunTemperature });
    const summary = phaseCurveSummary(sim.history, curve);
    const { occultationSeconds } = conjunctionTimes(c.orbit, observer);
    const lead = occultationSeconds - summary.timeOfMaxSeconds;
    expect(lead).toBeGreaterThan(0.01 * c.orbit.periodSeconds);
    expect(lead).toBeLessThan(0.25 * c.orbit.periodSeconds);
  });
});

describe("map regime beside a published measurement (a comparison, not a fit)", () => {
  it("puts HAT-P-2b's 4.5 µm phase-curve peak within a few hours after periastron, as Lewis et al. (2013, ApJ 766, 95) measured (4.39–5.84 h)", () => {
    // Orbit and star from memory of Lewis et al. (2013) and the discovery papers, not checked against the printed
    // tables: P = 5.6334729 d, e = 0.517, ω = 188.09°, i = 86.72°, M★ = 1.36 M☉, R★ = 1.64 R☉, T★ = 6290 K,
    // R_p = 0.951 R_J. Spin 3:1, near the pseudo-synchronous rate for e = 0.52 (Hut 1981, A&A 99, 126; from memory).
    const periodSeconds = 5.6334729 * DAY_S;
    const massParameter = 1.36 * SOLAR_MASS_PARAMETER;
    const a = Math.cbrt((massParameter * periodSeconds ** 2) / (4 * Math.PI ** 2));
    const starRadius = 1.64 * SOLAR_RADIUS_M;
    const starTemperature = 6290;
    const c: MapCase = {
      orbit: { semiMajorAxisM: a, eccentricity: 0.517, periodSeconds, meanAnomalyAtStartRad: 0 },
      luminosityW: 4 * Math.PI * starRadius ** 2 * STEFAN_BOLTZMANN * starTemperature ** 4,
      albedo: 0.05,
      emissivity: 1,
      heatCapacityJPerM2K: 8e6,
      internalFluxWPerM2: 0,
      spin: { rateRadPerSecond: (3 * 2 * Math.PI) / periodSeconds, obliquityRad: 0, equinoxTrueAnomalyRad: 0, ratio: { spin: 3, orbit: 1 } },
      windRadPerSecond: 0,
      longitudes: 24,
      latitudes: 12,
    };
    const sim = simulateMap(c, { samples: 600 });
    expect(sim.radiativeTimeSeconds / 3600).toBeGreaterThan(1); // "a radiative time of a few hours"
    expect(sim.radiativeTimeSeconds / 3600).toBeLessThan(8);
    const telescope = {
      observer: { inclinationRad: 86.72 * DEG, argumentOfPeriastronRad: 188.09 * DEG, longitudeOfNodeRad: 0 },
      band: new BandRadiance({ kind: "tophat", fromM: 4.0e-6, toM: 5.0e-6 }),
      planetRadiusM: 0.951 * JUPITER_EQUATORIAL_RADIUS_M,
      starRadiusM: starRadius,
      starTemperatureK: starTemperature,
    };
    const summary = phaseCurveSummary(sim.history, phaseCurve(sim.history, telescope));
    const hours = summary.timeOfMaxAfterPeriastronSeconds / 3600;
    expect(hours).toBeGreaterThan(0);
    expect(Math.abs(hours - 5.84)).toBeLessThan(4);
  });
});

describe("the phase curve's band radiances", () => {
  it("read every cell of a map from the map's band table to 1e-6 of the passband's own table", async () => {
    const { bandTable, tableRadiance } = await import("../src/analysis/phaseCurve.js");
    const sim = simulateMap(mapCase({ e: 0.5, heatCapacity: 3e6, longitudes: 12, latitudes: 6 }), { samples: 40 });
    for (const [fromM, toM] of [[4e-6, 5e-6], [2e-6, 2.5e-6], [15e-6, 20e-6]] as const) {
      const band = new BandRadiance({ kind: "tophat", fromM, toM });
      const table = bandTable(sim.history, band);
      let worst = 0;
      sim.history.temperatureK.forEach((t) => {
        const direct = band.at(t);
        if (direct > 1e-12 * band.at(2000)) worst = Math.max(worst, Math.abs(tableRadiance(table, t) / direct - 1));
      });
      expect(worst).toBeLessThan(1e-6);
    }
  });

  it("sum each sample's visible disc to 2e-6 of the same sum made with direct quadrature of Planck's law per cell", () => {
    // Independent of both tables: Σ_k B_band(T_k) μ_k ΔA_k with B_band by Gauss–Legendre quadrature
    // at each cell's own temperature, the observer direction taken from the curve's sub-observer point.
    const c = mapCase({ e: 0.5, heatCapacity: 3e6, longitudes: 12, latitudes: 6 });
    const sim = simulateMap(c, { samples: 24 });
    const { grid, temperatureK } = sim.history;
    const cells = grid.longitudes * grid.latitudes;
    const observer: Observer = { inclinationRad: 70 * DEG, argumentOfPeriastronRad: 120 * DEG, longitudeOfNodeRad: 0 };
    const rp = 1e8;
    for (const [fromM, toM] of [[2e-6, 2.5e-6], [4e-6, 5e-6], [8e-6, 14e-6]] as const) {
      const band = new BandRadiance({ kind: "tophat", fromM, toM });
      const telescope = { observer, band, planetRadiusM: rp, starRadiusM: SOLAR_RADIUS_M, starTemperatureK: sunTemperature };
      const curve = phaseCurve(sim.history, telescope);
      const starDirect = bandRadianceDirect(band.band, sunTemperature);
      let worst = 0;
      for (let s = 0; s < curve.fluxRatio.length; s++) {
        const lon = curve.subObserverLongitudeRad[s]!;
        const lat = curve.subObserverLatitudeRad[s]!;
        const o = [Math.cos(lat) * Math.cos(lon), Math.cos(lat) * Math.sin(lon), Math.sin(lat)];
        let sum = 0;
        for (let k = 0; k < cells; k++) {
          const mu = grid.normalX[k]! * o[0]! + grid.normalY[k]! * o[1]! + grid.normalZ[k]! * o[2]!;
          if (mu > 0) sum += bandRadianceDirect(band.band, temperatureK[s * cells + k]!) * mu * grid.areaFraction[k]!;
        }
        const direct = (4 * rp * rp * sum) / (SOLAR_RADIUS_M * SOLAR_RADIUS_M * starDirect);
        worst = Math.max(worst, Math.abs(curve.planetOnlyFluxRatio[s]! / direct - 1));
      }
      expect(worst).toBeLessThan(2e-6);
    }
  });
});
