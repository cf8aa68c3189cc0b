import { Body, HelioDistance, MakeTime } from "astronomy-engine";
import fc from "fast-check";
import { describe, expect, it } from "vitest";
import { ASTRONOMICAL_UNIT_M, DAY_S, SOLAR_MASS_PARAMETER } from "../src/constants.js";
import { CalorbitError } from "../src/errors.js";
import { eccentricAnomaly, eccentricFromTrue, meanAnomalyFromEccentric, trueAnomalyFromEccentric } from "../src/physics/kepler.js";
import { apastronM, distanceAt, keplerPeriodSeconds, periastronM, type Orbit } from "../src/physics/orbit.js";

const deg = Math.PI / 180;

describe("Kepler's equation against published worked examples", () => {
  it("matches Vallado, Fundamentals of Astrodynamics and Applications, 4th ed., Example 2-1 to 1e-9 rad", () => {
    // M = 235.4°, e = 0.4 → E = 3.84866174509717 rad
    const E = eccentricAnomaly(235.4 * deg, 0.4);
    expect(Math.abs(E - 3.84866174509717)).toBeLessThan(1e-9);
  });

  it("matches Meeus, Astronomical Algorithms, 2nd ed., Example 30.a (E and ν)", () => {
    const E = eccentricAnomaly(5 * deg, 0.1);
    expect(Math.abs(E / deg - 5.554589)).toBeLessThan(5e-7);
    expect(Math.abs(trueAnomalyFromEccentric(E, 0.1) / deg - 6.139762)).toBeLessThan(5e-7);
  });

  it("matches the M = 5° table for e = 0.2 … 0.99 (Meeus 1991 ch. 30; Colwell 1993) to 5e-7°", () => {
    const table: Array<[number, number]> = [
      [0.2, 6.246908], [0.3, 7.13496], [0.4, 8.313903], [0.5, 9.950063], [0.6, 12.356653],
      [0.7, 16.16799], [0.8, 22.656579], [0.9, 33.344447], [0.99, 45.361023],
    ];
    for (const [e, expected] of table) {
      expect(Math.abs(eccentricAnomaly(5 * deg, e) / deg - expected)).toBeLessThan(5e-7);
    }
  });

  it("matches e = 0.99 at M = 1°, 2°, 33° (Colwell 1993) to 5e-7°", () => {
    for (const [m, expected] of [[1, 24.725822], [2, 32.361007], [33, 89.722155]] as const) {
      expect(Math.abs(eccentricAnomaly(m * deg, 0.99) / deg - expected)).toBeLessThan(5e-7);
    }
  });

  it("matches Montenbruck & Gill, Satellite Orbits (2000), Exercise 2-2 to 1e-9 rad", () => {
    expect(Math.abs(eccentricAnomaly(4 * deg, 0.72) - 0.24318719638)).toBeLessThan(1e-9);
    expect(Math.abs(eccentricAnomaly(50 * deg, 0.72) - 1.59249513093)).toBeLessThan(1e-9);
  });

  it("matches Curtis, Orbital Mechanics for Engineering Students, 3rd ed., Example 3.2 to 1e-4 rad", () => {
    expect(Math.abs(eccentricAnomaly(3.6029, 0.37255) - 3.4794)).toBeLessThan(1e-4);
  });
});

describe("Kepler's equation: invariants and bad input", () => {
  it("round-trips M → E → M to 1e-12 rad over 10⁵ random (M, e), e up to 0.999", () => {
    fc.assert(
      fc.property(
        fc.double({ min: -20, max: 20, noNaN: true }),
        fc.oneof(fc.double({ min: 0, max: 0.999, noNaN: true }), fc.constantFrom(0, 0.9, 0.99, 0.999)),
        (m, e) => {
          const E = eccentricAnomaly(m, e);
          return Math.abs(meanAnomalyFromEccentric(E, e) - m) <= 1e-12 * Math.max(1, Math.abs(m));
        },
      ),
      { numRuns: 100_000 },
    );
  });

  it("returns M itself on a circular orbit", () => {
    expect(eccentricAnomaly(1.234, 0)).toBe(1.234);
  });

  it("round-trips the true anomaly through E on the same revolution", () => {
    for (const e of [0, 0.3, 0.9, 0.999]) {
      for (const E of [-7, -3.1, 0, 0.5, 3.14159, 9.5]) {
        expect(eccentricFromTrue(trueAnomalyFromEccentric(E, e), e)).toBeCloseTo(E, 12);
      }
    }
  });

  it("rejects e = 1, e < 0 and NaN with a typed error", () => {
    for (const e of [1, 1.5, -0.1, Number.NaN]) {
      expect(() => eccentricAnomaly(1, e)).toThrowError(CalorbitError);
    }
    expect(() => eccentricAnomaly(Number.NaN, 0.1)).toThrowError(/meanAnomaly/);
  });
});

describe("orbit geometry", () => {
  const orbit: Orbit = { semiMajorAxisM: 2e11, eccentricity: 0.4, periodSeconds: 1e7, meanAnomalyAtStartRad: 0 };
  it("is at periastron a(1 − e) at t = 0 and at apastron a(1 + e) half a period later (common practice)", () => {
    expect(distanceAt(orbit, 0)).toBeCloseTo(periastronM(orbit), 0);
    expect(periastronM(orbit)).toBe(1.2e11);
    expect(distanceAt(orbit, 5e6) / apastronM(orbit)).toBeCloseTo(1, 14);
  });
  it("gives a one-year period at 1 au around the IAU nominal solar GM (Kepler's third law)", () => {
    const p = keplerPeriodSeconds(ASTRONOMICAL_UNIT_M, SOLAR_MASS_PARAMETER);
    expect(p / DAY_S).toBeCloseTo(365.2568983, 3); // Gaussian-year value 365.2568983 d, common practice
  });
});

describe("two-body distance against an ephemeris", () => {
  // Elements at J2000: Standish & Williams, "Keplerian Elements for Approximate Positions of the
  // Major Planets" (JPL), Table 1; M₀ = L − ϖ. Reference distances: npm astronomy-engine HelioDistance.
  const bodies = [
    { body: Body.Mercury, a: 0.38709927, e: 0.20563593, m0: 174.79252722 },
    { body: Body.Mars, a: 1.52371034, e: 0.0933941, m0: 19.39019754 },
    { body: Body.Earth, a: 1.00000261, e: 0.01671123, m0: -2.47311027 },
  ];
  for (const { body, a, e, m0 } of bodies) {
    it(`follows ${body}'s heliocentric distance over a year within 1%`, () => {
      const orbit: Orbit = {
        semiMajorAxisM: a * ASTRONOMICAL_UNIT_M,
        eccentricity: e,
        periodSeconds: keplerPeriodSeconds(a * ASTRONOMICAL_UNIT_M, SOLAR_MASS_PARAMETER),
        meanAnomalyAtStartRad: m0 * deg,
      };
      let worst = 0;
      for (let day = 0; day <= 365; day += 5) {
        const ours = distanceAt(orbit, day * DAY_S) / ASTRONOMICAL_UNIT_M;
        const reference = HelioDistance(body, MakeTime(day)); // days after J2000 (2000-01-01 12:00)
        worst = Math.max(worst, Math.abs(ours / reference - 1));
      }
      expect(worst).toBeLessThan(0.01);
    });
  }
});

describe("output samples uniform in time (the series' Kepler solve)", () => {
  it("solve M = E − e sin E at every sample to 1e-13 rad, with sin E and cos E to 1e-15 (Kepler's equation, common practice)", async () => {
    const { anomaliesUniformInTime } = await import("../src/analysis/orbitSampling.js");
    for (const e of [0, 0.3, 0.9, 0.995]) {
      const orbit: Orbit = { semiMajorAxisM: ASTRONOMICAL_UNIT_M, eccentricity: e, periodSeconds: 3e7, meanAnomalyAtStartRad: 0 };
      for (const [startE, orbits, count] of [[0, 1, 1000], [2.5, 3, 777], [-1, 1, 50]] as const) {
        const trig = { sinE: new Float64Array(count), cosE: new Float64Array(count) };
        const E = anomaliesUniformInTime(orbit, startE, orbits, count, trig);
        const startM = startE - e * Math.sin(startE);
        let worstKepler = 0;
        let worstTrig = 0;
        for (let j = 0; j < count; j++) {
          const m = startM + (2 * Math.PI * orbits * j) / (count - 1);
          const scale = Math.max(1, Math.abs(m));
          worstKepler = Math.max(worstKepler, Math.abs(E[j]! - e * Math.sin(E[j]!) - m) / scale);
          worstTrig = Math.max(worstTrig, Math.abs(trig.sinE[j]! - Math.sin(E[j]!)) / scale, Math.abs(trig.cosE[j]! - Math.cos(E[j]!)) / scale);
        }
        expect(worstKepler).toBeLessThan(1e-13);
        expect(worstTrig).toBeLessThan(1e-15);
      }
    }
  });
});
