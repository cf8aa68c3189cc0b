import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, SOLAR_LUMINOSITY_W } from "../src/constants.js";
import { CalorbitError } from "../src/errors.js";
import { albedoAtIncidence } from "../src/physics/albedo.js";
import { stellarFlux } from "../src/physics/flux.js";
import { pointForcing } from "../src/physics/forcing.js";
import { resolveScenario } from "../src/scenario/resolve.js";
import { simulate } from "../src/run/simulate.js";
import { nominalCase } from "./helpers.js";

const deg = Math.PI / 180;
// Hayne et al. 2017, JGR Planets 122, 2371, appendix (from memory): A(θ) = A₀ + a (θ/45°)³ + b (θ/90°)⁸,
// with A₀ = 0.12, a = 0.06, b = 0.25 for the Moon.
const MOON = { a: 0.06, b: 0.25 };
const published = (a0: number, a: number, b: number, thetaDeg: number) => a0 + a * (thetaDeg / 45) ** 3 + b * (thetaDeg / 90) ** 8;

describe("incidence-dependent albedo A(θ)", () => {
  it("reproduces the published form at every angle (Hayne et al. 2017, appendix, from memory)", () => {
    for (let thetaDeg = 0; thetaDeg <= 90; thetaDeg += 2.5) {
      expect(Math.abs(albedoAtIncidence(0.12, MOON, thetaDeg * deg) - published(0.12, 0.06, 0.25, thetaDeg))).toBeLessThan(1e-14);
    }
    // Its landmarks: A₀ at normal incidence, A₀ + a + b/256 at 45°, A₀ + 8a + b at grazing light.
    expect(albedoAtIncidence(0.12, MOON, 0)).toBe(0.12);
    expect(albedoAtIncidence(0.12, MOON, 45 * deg)).toBeCloseTo(0.12 + 0.06 + 0.25 / 256, 14);
    expect(albedoAtIncidence(0.12, MOON, 90 * deg)).toBeCloseTo(0.85, 14);
  });

  it("makes a point absorb (1 − A(z)) S cos z, with z from the spin and the orbit", () => {
    // Equator, no obliquity, circular orbit, 2:1 spin: the star's hour angle is H = λ + (Ω − n) t = λ + M,
    // so cos z = cos(λ + M) (spherical astronomy, common practice); on a circular orbit E = M.
    const P = 3.15576e7;
    const n = (2 * Math.PI) / P;
    const orbit = nominalCase({ e: 0 }).orbit;
    const spin = { rateRadPerSecond: 2 * n, obliquityRad: 0, equinoxTrueAnomalyRad: 0 };
    const forcing = pointForcing(0.12, SOLAR_LUMINOSITY_W, orbit, 0, 0.4, spin, 1, MOON);
    const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    for (let k = 0; k < 64; k++) {
      const M = (2 * Math.PI * k) / 64;
      const cosZ = Math.cos(0.4 + M);
      const zDeg = Math.acos(Math.min(1, cosZ)) / deg;
      const expected = cosZ > 0 ? (1 - published(0.12, 0.06, 0.25, zDeg)) * s * cosZ : 0;
      expect(Math.abs(forcing.absorbedAt(M) - expected)).toBeLessThan(1e-9 * s);
    }
  });

  it("leaves the substellar point at A₀ (θ = 0 there) and lowers a point's mean absorbed flux", () => {
    const substellar = { ...nominalCase({ e: 0.1, albedo: 0.12, heatCapacity: 1e6 }), regime: "substellar" as const };
    const plain = simulate(substellar, { samples: 0 });
    const withLaw = simulate({ ...substellar, surface: { ...substellar.surface, albedoIncidence: MOON } }, { samples: 0 });
    expect(withLaw.summary.temperature).toEqual(plain.summary.temperature);
    const point = {
      ...nominalCase({ e: 0, albedo: 0.12, heatCapacity: 1e6 }),
      regime: "point" as const,
      location: { latitudeRad: 0, longitudeRad: 0 },
      spin: { rateRadPerSecond: (2 * 2 * Math.PI) / 3.15576e7, ratio: { spin: 2, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 },
    };
    const a = simulate(point, { samples: 0 }).summary.meanAbsorbedWPerM2!;
    const b = simulate({ ...point, surface: { ...point.surface, albedoIncidence: MOON } }, { samples: 0 }).summary.meanAbsorbedWPerM2!;
    // Over a day at the equator the mean is (S/π)∫₀^{π/2} (1 − A(z)) cos z dz (z = H here); by quadrature:
    let integral = 0;
    const steps = 20000;
    for (let j = 0; j < steps; j++) {
      const z = ((j + 0.5) / steps) * (Math.PI / 2);
      integral += (1 - published(0.12, 0.06, 0.25, z / deg)) * Math.cos(z) * (Math.PI / 2 / steps);
    }
    const s = stellarFlux(SOLAR_LUMINOSITY_W, ASTRONOMICAL_UNIT_M);
    expect(Math.abs(b / ((s / Math.PI) * integral) - 1)).toBeLessThan(1e-6);
    expect(Math.abs(a / ((s * 0.88) / Math.PI) - 1)).toBeLessThan(1e-6);
    expect(b).toBeLessThan(a);
  });

  const scenario = (regime: string, albedo: number, albedoIncidence: unknown) => ({
    name: "x",
    star: { luminosity: "1 Lsun", mass: "1 Msun" },
    orbit: { semiMajorAxis: "1 au", eccentricity: 0 },
    body: { albedo, heatCapacity: 1e6, albedoIncidence },
    regime,
  });
  const problemsOf = (doc: unknown): string[] => {
    try {
      resolveScenario(doc);
    } catch (error) {
      return (error as CalorbitError).problems.map((p) => `${p.path}: ${p.allowed}`);
    }
    return [];
  };

  it("is read from body.albedoIncidence {a, b} for a point, and refused where there is no single incidence angle", () => {
    expect(resolveScenario(scenario("point", 0.12, MOON)).thermal.surface.albedoIncidence).toEqual(MOON);
    expect(problemsOf(scenario("global", 0.12, MOON))).toEqual(["body.albedoIncidence: regime point (or substellar); regime global has no single incidence angle"]);
    expect(problemsOf(scenario("point", 0.5, { a: 0.06, b: 0.25 }))).toEqual([
      "body.albedoIncidence: a and b with albedo + 8a + b ≤ 1 (the albedo at 90° incidence; here 1.23)",
    ]);
    expect(problemsOf(scenario("point", 0.12, { a: -0.1, b: 0.25 }))).toEqual(["body.albedoIncidence.a: a number ≥ 0"]);
    expect(problemsOf(scenario("point", 0.12, { a: 0.06 }))).toEqual(["body.albedoIncidence.b: a number ≥ 0"]);
    // A case built without a scenario is held to the same rule by the engine.
    const global = { ...nominalCase({ albedo: 0.12 }), surface: { ...nominalCase({ albedo: 0.12 }).surface, albedoIncidence: MOON } };
    expect(() => simulate(global, { samples: 0 })).toThrowError(expect.objectContaining({ code: "INVALID_ARGUMENT", message: "an incidence-dependent albedo needs one place on the surface" }));
  });
});
