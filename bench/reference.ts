/**
 * The benchmark's reference answers, computed independently of calorbit's solver: the energy
 * balance C dT/dt = F(t) + q − εσT⁴ (common practice) integrated by the classical fourth-order
 * Runge–Kutta method with fixed steps in the eccentric anomaly E (dt/dE = (1 − e cos E)/n, so no
 * Kepler solve is needed), a point's sunrise and sunset found by bisection and placed on step
 * ends (inside an arc the forcing is smooth and RK4 keeps its order), the periodic start found by
 * the secant method on T(cycle) − T(0) (two-state cases: orbit after orbit until the start is
 * forgotten). Time means by the trapezoidal rule in E weighted by dt/dE; extremes from the step
 * grid, refined by a parabola through the three points around an interior extremum.
 *
 * None of calorbit's forcing, integrators, shooting or statistics is used: only the case data and
 * the physical constants. Each case is run at N and 2N steps; the largest relative change of the
 * mean, minimum and maximum is stored as the reference's own error estimate.
 *
 * `npm run build && node dist/bench/reference.js` rewrites bench/references.json (about a minute).
 */
import { execSync } from "node:child_process";
import { existsSync, readFileSync, writeFileSync } from "node:fs";
import { fileURLToPath } from "node:url";
import { STEFAN_BOLTZMANN, type ThermalCase } from "../src/index.js";
import { REFERENCE_CASES } from "./cases.js";

const TWO_PI = 2 * Math.PI;

export interface ReferenceValue {
  /** Time means, minima and maxima of each state, K (one state, or day and night). */
  meanK: number[];
  minK: number[];
  maxK: number[];
  /** Largest relative change of any of them from N to 2N steps. */
  estimatedRelativeError: number;
  stepsPerCycle: number;
}

interface Problem {
  states: number;
  cycleOrbits: number;
  /** dT/dE into out. */
  rate(E: number, y: Float64Array, out: Float64Array): void;
  /** Corners of the forcing in [0, 2π·cycle] (sorted), where arcs must end. */
  corners: number[];
  guessK: number;
}

/** ν from E, continuous in E (ν − E is bounded): ν = E + 2 atan(β sin E / (1 − β cos E)), β = e/(1 + √(1 − e²)). */
function trueAnomaly(E: number, e: number): number {
  const beta = e / (1 + Math.sqrt(1 - e * e));
  return E + 2 * Math.atan((beta * Math.sin(E)) / (1 - beta * Math.cos(E)));
}

function problemFor(c: ThermalCase): Problem {
  const { orbit, surface, star } = c;
  const e = orbit.eccentricity;
  const n = TWO_PI / orbit.periodSeconds;
  const sigmaEps = surface.emissivity * STEFAN_BOLTZMANN;
  const heatCapacity = surface.heatCapacityJPerM2K;
  if (heatCapacity === undefined) throw new Error("reference: slab cases only");
  const inverseC = 1 / heatCapacity;
  const q = surface.internalFluxWPerM2;
  const flux = (E: number): number => {
    const r = orbit.semiMajorAxisM * (1 - e * Math.cos(E));
    return ((1 - surface.albedo) * star.luminosityW) / (4 * Math.PI * r * r);
  };
  const dtdE = (E: number): number => (1 - e * Math.cos(E)) / n;
  const guessK = Math.sqrt(Math.sqrt((flux(Math.PI / 2) / 4 + q) / sigmaEps));
  if (c.regime === "daynight") {
    const k = c.exchange!.coefficientWPerM2K;
    if (c.exchange!.weighting !== "uniform" || c.exchange!.recirculation !== 0) throw new Error("reference: daynight with a uniform dayside and an exchange coefficient only");
    return {
      states: 2,
      cycleOrbits: 1,
      corners: [],
      guessK,
      rate(E, y, out) {
        const g = dtdE(E) * inverseC;
        const h = k * (y[0]! - y[1]!);
        // Uniform dayside: half the sphere's absorbed flux lands on the day hemisphere's area.
        out[0] = g * (0.5 * flux(E) + q - sigmaEps * y[0]! ** 4 - h);
        out[1] = g * (q - sigmaEps * y[1]! ** 4 + h);
      },
    };
  }
  if (c.regime === "global") {
    return {
      states: 1,
      cycleOrbits: 1,
      corners: [],
      guessK,
      rate(E, y, out) {
        out[0] = dtdE(E) * inverseC * (0.25 * flux(E) + q - sigmaEps * y[0]! ** 4);
      },
    };
  }
  if (c.regime === "band") {
    const phi = c.location!.latitudeRad;
    const theta = c.spin!.obliquityRad;
    const nuEq = c.spin!.equinoxTrueAnomalyRad;
    return {
      states: 1,
      cycleOrbits: 1,
      corners: [],
      guessK,
      rate(E, y, out) {
        // Daily-mean insolation (Berger 1978): (S/π)(h₀ sin φ sin δ + cos φ cos δ sin h₀), cos h₀ = −tan φ tan δ.
        const delta = Math.asin(Math.sin(theta) * Math.sin(trueAnomaly(E, e) - nuEq));
        const cosH0 = Math.max(-1, Math.min(1, -Math.tan(phi) * Math.tan(delta)));
        const h0 = Math.acos(cosH0);
        const daily = (flux(E) / Math.PI) * (h0 * Math.sin(phi) * Math.sin(delta) + Math.cos(phi) * Math.cos(delta) * Math.sin(h0));
        out[0] = dtdE(E) * inverseC * (daily + q - sigmaEps * y[0]! ** 4);
      },
    };
  }
  if (c.regime === "point") {
    const spin = c.spin!;
    const loc = c.location!;
    if (spin.obliquityRad !== 0 || loc.latitudeRad !== 0) throw new Error("reference: points on the equator of an untilted body only");
    const ratio = spin.rateRadPerSecond / n;
    const cycleOrbits = spin.ratio!.orbit;
    // Hour angle H = λ + Ω(t − t_p) − ν (zero obliquity, t_p = 0 at E = 0); cos z = cos H on the equator.
    const hourAngle = (E: number): number => loc.longitudeRad + ratio * (E - e * Math.sin(E)) - trueAnomaly(E, e);
    const corners: number[] = [];
    const end = TWO_PI * cycleOrbits;
    // H increases monotonically for a spin faster than 2n (dH/dE = ratio(1 − e cos E) − √(1−e²)/(1 − e cos E) > 0).
    if (!(ratio * (1 - e) > Math.sqrt(1 - e * e) / (1 - e))) throw new Error("reference: spin too slow for the monotone hour angle");
    const first = Math.ceil((hourAngle(0) - Math.PI / 2) / Math.PI);
    for (let j = first; ; j++) {
      const target = Math.PI / 2 + j * Math.PI;
      if (hourAngle(end) <= target) break;
      let lo = 0;
      let hi = end;
      for (let i = 0; i < 200 && hi - lo > 1e-15 * end; i++) {
        const mid = 0.5 * (lo + hi);
        if (hourAngle(mid) < target) lo = mid;
        else hi = mid;
      }
      corners.push(0.5 * (lo + hi));
    }
    return {
      states: 1,
      cycleOrbits,
      corners,
      guessK,
      rate(E, y, out) {
        const mu = Math.cos(hourAngle(E));
        out[0] = dtdE(E) * inverseC * ((mu > 0 ? flux(E) * mu : 0) + q - sigmaEps * y[0]! ** 4);
      },
    };
  }
  throw new Error(`reference: regime ${c.regime} not covered`);
}

interface Pass {
  end: Float64Array;
  es: Float64Array;
  ys: Float64Array;
}

/** One cycle of RK4 from y0, `perRadian` steps per radian of E (at least one per arc); records every step. */
function integrateCycle(p: Problem, y0: Float64Array, perRadian: number, record: boolean): Pass {
  const d = p.states;
  const end = TWO_PI * p.cycleOrbits;
  const bounds = [0, ...p.corners.filter((x) => x > 0 && x < end), end];
  let total = 0;
  for (let a = 0; a + 1 < bounds.length; a++) total += Math.max(1, Math.ceil((bounds[a + 1]! - bounds[a]!) * perRadian)) + 1;
  const es = new Float64Array(record ? total : 0);
  const ys = new Float64Array(record ? total * d : 0);
  const y = Float64Array.from(y0);
  const k1 = new Float64Array(d);
  const k2 = new Float64Array(d);
  const k3 = new Float64Array(d);
  const k4 = new Float64Array(d);
  const tmp = new Float64Array(d);
  let at = 0;
  const put = (E: number) => {
    if (!record) return;
    es[at] = E;
    for (let i = 0; i < d; i++) ys[at * d + i] = y[i]!;
    at++;
  };
  for (let a = 0; a + 1 < bounds.length; a++) {
    const from = bounds[a]!;
    const to = bounds[a + 1]!;
    const steps = Math.max(1, Math.ceil((to - from) * perRadian));
    const h = (to - from) / steps;
    put(from);
    for (let s = 0; s < steps; s++) {
      const E = from + s * h;
      p.rate(E, y, k1);
      for (let i = 0; i < d; i++) tmp[i] = y[i]! + 0.5 * h * k1[i]!;
      p.rate(E + 0.5 * h, tmp, k2);
      for (let i = 0; i < d; i++) tmp[i] = y[i]! + 0.5 * h * k2[i]!;
      p.rate(E + 0.5 * h, tmp, k3);
      for (let i = 0; i < d; i++) tmp[i] = y[i]! + h * k3[i]!;
      p.rate(s === steps - 1 ? to : E + h, tmp, k4);
      for (let i = 0; i < d; i++) y[i] = y[i]! + (h / 6) * (k1[i]! + 2 * k2[i]! + 2 * k3[i]! + k4[i]!);
      if (s < steps - 1) put(E + h);
    }
    put(to);
  }
  return { end: y, es, ys };
}

function periodicStart(p: Problem, perRadian: number): Float64Array {
  if (p.states === 1) {
    // Secant on g(T₀) = T(cycle) − T₀.
    let xa = p.guessK;
    let ga = integrateCycle(p, Float64Array.of(xa), perRadian, false).end[0]! - xa;
    let xb = xa * 1.02;
    let gb = integrateCycle(p, Float64Array.of(xb), perRadian, false).end[0]! - xb;
    for (let i = 0; i < 60 && Math.abs(gb) > 1e-13 * xb && gb !== ga; i++) {
      const next = xb - (gb * (xb - xa)) / (gb - ga);
      xa = xb;
      ga = gb;
      xb = Math.max(next, 0.2 * xb);
      gb = integrateCycle(p, Float64Array.of(xb), perRadian, false).end[0]! - xb;
    }
    if (!(Math.abs(gb) <= 1e-11 * xb)) throw new Error(`reference: secant did not converge (g = ${gb})`);
    return Float64Array.of(xb);
  }
  let y: Float64Array = new Float64Array(p.states).fill(p.guessK);
  for (let orbit = 0; orbit < 200; orbit++) {
    const next = integrateCycle(p, y, perRadian, false).end;
    let change = 0;
    for (let i = 0; i < p.states; i++) change = Math.max(change, Math.abs(next[i]! - y[i]!) / next[i]!);
    y = next;
    if (change <= 1e-14) return y;
  }
  throw new Error("reference: relaxation did not converge");
}

function statistics(p: Problem, pass: Pass, e: number): { meanK: number[]; minK: number[]; maxK: number[] } {
  const d = p.states;
  const { es, ys } = pass;
  const count = es.length;
  const meanK: number[] = [];
  const minK: number[] = [];
  const maxK: number[] = [];
  for (let i = 0; i < d; i++) {
    let integral = 0;
    for (let k = 1; k < count; k++) {
      const wa = 1 - e * Math.cos(es[k - 1]!);
      const wb = 1 - e * Math.cos(es[k]!);
      integral += 0.5 * (es[k]! - es[k - 1]!) * (ys[(k - 1) * d + i]! * wa + ys[k * d + i]! * wb);
    }
    meanK.push(integral / (TWO_PI * p.cycleOrbits)); // ∫(1 − e cos E) dE over whole orbits = 2π per orbit
    const extreme = (sign: 1 | -1): number => {
      let best = 0;
      for (let k = 1; k < count; k++) if (sign * ys[k * d + i]! > sign * ys[best * d + i]!) best = k;
      const v = ys[best * d + i]!;
      if (best === 0 || best === count - 1) return v;
      const x0 = es[best - 1]!;
      const x1 = es[best]!;
      const x2 = es[best + 1]!;
      if (x0 === x1 || x1 === x2) return v; // on an arc end (a corner): the grid value is the extremum
      const y0 = ys[(best - 1) * d + i]!;
      const y2 = ys[(best + 1) * d + i]!;
      // Parabola through the three points; its vertex value.
      const d1 = (v - y0) / (x1 - x0);
      const d2 = (y2 - v) / (x2 - x1);
      const a = (d2 - d1) / (x2 - x0);
      if (a === 0) return v;
      // P(x) = y0 + d1 (x − x0) + a (x − x0)(x − x1); P'(xv) = 0.
      const xv = 0.5 * (x0 + x1) - d1 / (2 * a);
      if (!(xv > x0 && xv < x2)) return v;
      return y0 + d1 * (xv - x0) + a * (xv - x0) * (xv - x1);
    };
    minK.push(extreme(-1));
    maxK.push(extreme(1));
  }
  return { meanK, minK, maxK };
}

export function referenceFor(c: ThermalCase, perRadian: number): ReferenceValue {
  const p = problemFor(c);
  const run = (density: number) => {
    const start = periodicStart(p, density);
    return statistics(p, integrateCycle(p, start, density, true), c.orbit.eccentricity);
  };
  const coarse = run(perRadian);
  const fine = run(2 * perRadian);
  let worst = 0;
  for (const key of ["meanK", "minK", "maxK"] as const) {
    fine[key].forEach((v, i) => (worst = Math.max(worst, Math.abs(v - coarse[key][i]!) / v)));
  }
  return { ...fine, estimatedRelativeError: worst, stepsPerCycle: Math.round(2 * perRadian * TWO_PI * p.cycleOrbits) };
}

/** Steps per radian of E for each case: enough that N → 2N changes nothing beyond ~1e-10. */
const DENSITY: Record<string, number> = {
  slab: 2000,
  slab100: 2000,
  stiff: 40_000,
  point365: 40_000,
  point1000: 80_000,
  band: 2000,
  daynight: 4000,
};

if (process.argv[1] === fileURLToPath(import.meta.url)) {
  const started = Date.now();
  let commit = "unknown";
  try {
    commit = execSync("git rev-parse --short HEAD", { encoding: "utf8" }).trim();
  } catch {
    // not a git checkout: provenance without the commit
  }
  const cases: Record<string, ReferenceValue> = {};
  for (const [name, make] of Object.entries(REFERENCE_CASES)) {
    const t0 = Date.now();
    cases[name] = referenceFor(make(), DENSITY[name]!);
    console.error(`${name}: ${JSON.stringify(cases[name])} (${((Date.now() - t0) / 1000).toFixed(1)} s)`);
  }
  const document = {
    provenance: {
      generator: "bench/reference.ts (npm run build && node dist/bench/reference.js)",
      method:
        "classical RK4 with fixed steps in the eccentric anomaly, arcs ending at sunrise/sunset (bisection), secant shooting (one state) or relaxation (two states); trapezoidal time means; parabolic refinement of extremes; run at N and 2N steps",
      independentOf: "calorbit's forcing, integrators, shooting and statistics (only the case data and src/constants.ts are shared)",
      commit,
      generatedAt: new Date().toISOString(),
      seconds: (Date.now() - started) / 1000,
    },
    cases,
  };
  const out = fileURLToPath(new URL("../../bench/references.json", import.meta.url));
  // The column's reference (columnReference.ts) is kept.
  const column = existsSync(out) ? JSON.parse(readFileSync(out, "utf8")).column : undefined;
  writeFileSync(out, JSON.stringify(column ? { ...document, column } : document, null, 2) + "\n");
  console.error(`wrote ${out}`);
}
