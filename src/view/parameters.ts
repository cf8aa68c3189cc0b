/**
 * The live viewer's parameters: what each control means, its slider scale and the values it allows,
 * and how the view's values become a thermal case. Pure: no DOM.
 *
 * A value shown in the page is the value computed: a slider gives a rounded value on its grid
 * (linear, or logarithmic for the heat capacity and the semi-major axis), and the number box beside
 * it takes an exact one. A value the user has not changed is the scenario's own (SI, unrounded), so
 * the page computes the same case as `calorbit run`. A slider moved away and back to where it
 * started gives back the exact value it started from.
 */
import { ASTRONOMICAL_UNIT_M, DAY_S } from "../constants.js";
import { slabHeatCapacity } from "../model/heatStore.js";
import type { Regime } from "../model/regimes.js";
import type { ThermalCase } from "../model/thermalCase.js";

export type ParameterKey = "e" | "albedo" | "emissivity" | "C" | "a" | "recirculation" | "latitude" | "longitude" | "obliquity";

export interface ParameterSpec {
  key: ParameterKey;
  /** The label beside the control, with its unit. */
  label: string;
  /** Field of the scenario it sets (for error messages). */
  field: string;
  scale: "linear" | "log";
  /** Slider range and step, in the slider's own coordinate (log10 of the value on a log scale). */
  min: number;
  max: number;
  step: number;
  /** Significant digits of a slider value on a log scale. */
  digits?: number;
  /** The values allowed, as a test and in words (for the one-line message). */
  allows: (v: number) => boolean;
  allowed: string;
  /** Regimes that use it (all when absent). */
  regimes?: readonly Regime[];
}

const deg = (rad: number) => (rad * 180) / Math.PI;

export const PARAMETERS: readonly ParameterSpec[] = [
  { key: "e", label: "eccentricity", field: "orbit.eccentricity", scale: "linear", min: 0, max: 0.95, step: 0.001, allows: (v) => v >= 0 && v < 1, allowed: "0 ≤ e < 1" },
  { key: "albedo", label: "Bond albedo", field: "body.albedo", scale: "linear", min: 0, max: 0.95, step: 0.001, allows: (v) => v >= 0 && v < 1, allowed: "0 ≤ A < 1" },
  { key: "emissivity", label: "emissivity", field: "body.emissivity", scale: "linear", min: 0.05, max: 1, step: 0.001, allows: (v) => v > 0 && v <= 1, allowed: "0 < ε ≤ 1" },
  { key: "C", label: "heat capacity (J m⁻² K⁻¹)", field: "body.heatCapacity", scale: "log", min: 3, max: 11, step: 0.005, digits: 4, allows: (v) => v > 0 && v < 1e15, allowed: "0 < C < 1e15 J m⁻² K⁻¹" },
  { key: "a", label: "semi-major axis (au)", field: "orbit.semiMajorAxis", scale: "log", min: -2, max: 1.7, step: 0.001, digits: 4, allows: (v) => v > 0 && v < 1e6, allowed: "0 < a < 1e6 au" },
  { key: "recirculation", label: "recirculation (0–1)", field: "body.recirculation", scale: "linear", min: 0, max: 1, step: 0.01, allows: (v) => v >= 0 && v <= 1, allowed: "0 ≤ ε_r ≤ 1", regimes: ["daynight"] },
  { key: "latitude", label: "latitude (deg)", field: "surface.latitude", scale: "linear", min: -90, max: 90, step: 0.5, allows: (v) => v >= -90 && v <= 90, allowed: "−90 to 90 deg", regimes: ["band", "point"] },
  { key: "longitude", label: "longitude (deg)", field: "surface.longitude", scale: "linear", min: -180, max: 180, step: 1, allows: (v) => v >= -360 && v <= 360, allowed: "−360 to 360 deg", regimes: ["point"] },
  { key: "obliquity", label: "obliquity (deg)", field: "spin.obliquity", scale: "linear", min: 0, max: 180, step: 0.5, allows: (v) => v >= 0 && v <= 180, allowed: "0 to 180 deg", regimes: ["band", "point"] },
];

export const PARAMETER = Object.fromEntries(PARAMETERS.map((p) => [p.key, p])) as Record<ParameterKey, ParameterSpec>;

/** Regimes that take a spin (the spin:orbit ratio or the sidereal period). */
export const SPIN_REGIMES: readonly Regime[] = ["point"];

/** Does this regime use that parameter? */
export function usesParameter(spec: ParameterSpec, regime: Regime): boolean {
  return spec.regimes === undefined || spec.regimes.includes(regime);
}

/** Drops floating-point noise from a value converted out of SI (0.7900000000000001 au → 0.79). */
export function clean(v: number): number {
  return Number(v.toPrecision(12));
}

/** The slider position (in the slider's coordinate) of a value, not snapped to the step. */
export function positionOf(spec: ParameterSpec, value: number): number {
  return spec.scale === "log" ? Math.log10(value) : value;
}

/** The value at a slider position, rounded to what the slider can mean (its step, or `digits` on a log scale). */
export function valueAt(spec: ParameterSpec, position: number): number {
  if (spec.scale === "log") return Number((10 ** position).toPrecision(spec.digits ?? 3));
  const decimals = Math.max(0, -Math.floor(Math.log10(spec.step) + 1e-9));
  return Number(position.toFixed(decimals));
}

/**
 * The value a slider gives: the exact value it was last set to (the scenario's, or one typed in the
 * box) while it sits where that value put it, otherwise the value at its position.
 */
export interface Anchor {
  value: number;
  /** The slider's position after it was set to `value` (as the browser snapped it). */
  position: number;
}
export function sliderValue(spec: ParameterSpec, position: number, anchor: Anchor): number {
  return Math.abs(position - anchor.position) <= spec.step * 1e-6 ? anchor.value : valueAt(spec, position);
}

/** Parses what a person typed in a number box: a finite number, or a one-line problem. */
export function parseTyped(spec: ParameterSpec, text: string): { value: number } | { problem: string } {
  const trimmed = text.trim();
  const v = trimmed === "" ? NaN : Number(trimmed);
  if (!Number.isFinite(v) || !spec.allows(v)) return { problem: `${spec.label}: given ${JSON.stringify(trimmed.slice(0, 40))}; allowed: ${spec.allowed}` };
  return { value: v };
}

/** A spin as the page's text box holds it: "p:q" (spin:orbit) or a sidereal period in days ("1.5 d"). */
export type SpinText = { ratio: { spin: number; orbit: number } } | { periodDays: number };

export function parseSpin(text: string): SpinText | { problem: string } {
  const t = text.trim();
  const r = /^(\d+)\s*:\s*(\d+)$/.exec(t);
  if (r && Number(r[1]) > 0 && Number(r[2]) > 0) return { ratio: { spin: Number(r[1]), orbit: Number(r[2]) } };
  const p = /^([0-9.]+(?:e[-+]?\d+)?)\s*(d|h)$/i.exec(t);
  if (p && Number(p[1]) > 0 && Number.isFinite(Number(p[1]))) return { periodDays: Number(p[1]) / (p[2]!.toLowerCase() === "h" ? 24 : 1) };
  return { problem: `spin: given ${JSON.stringify(t.slice(0, 40))}; allowed: a spin:orbit ratio such as 1:1 or 3:2, or a sidereal period such as 1.5 d or 20 h` };
}

export function spinText(c: ThermalCase): string {
  const spin = c.spin;
  if (!spin) return "1:1";
  if (spin.ratio) return `${spin.ratio.spin}:${spin.ratio.orbit}`;
  return `${clean((2 * Math.PI) / spin.rateRadPerSecond / DAY_S)} d`;
}

/** Every value of the live view: the parameters in the page's units, the spin text, the regime. */
export type ParameterValues = Record<ParameterKey, number> & { spin: string; regime: Regime };

/** The values of a thermal case in the page's units. */
export function valuesOf(c: ThermalCase): ParameterValues {
  return {
    e: c.orbit.eccentricity,
    albedo: c.surface.albedo,
    emissivity: c.surface.emissivity,
    C: slabHeatCapacity(c),
    a: clean(c.orbit.semiMajorAxisM / ASTRONOMICAL_UNIT_M),
    recirculation: c.exchange?.recirculation ?? 0,
    latitude: clean(deg(c.location?.latitudeRad ?? 0)),
    longitude: clean(deg(c.location?.longitudeRad ?? 0)),
    obliquity: clean(deg(c.spin?.obliquityRad ?? 0)),
    spin: spinText(c),
    regime: c.regime,
  };
}

/**
 * The base case with the view's values. A value equal to the base's own (as `valuesOf` shows it)
 * keeps the base's exact SI value; the period follows Kepler's third law when a changes, and a
 * resonant spin follows the period.
 */
export function caseFor(base: ThermalCase, v: ParameterValues): ThermalCase {
  const b = valuesOf(base);
  const rad = (d: number) => (d * Math.PI) / 180;
  const aM = v.a === b.a ? base.orbit.semiMajorAxisM : v.a * ASTRONOMICAL_UNIT_M;
  const periodSeconds = v.a === b.a ? base.orbit.periodSeconds : base.orbit.periodSeconds * (aM / base.orbit.semiMajorAxisM) ** 1.5;
  const thermal: ThermalCase = {
    ...base,
    regime: v.regime,
    orbit: { ...base.orbit, eccentricity: v.e, semiMajorAxisM: aM, periodSeconds },
    surface: { ...base.surface, albedo: v.albedo, emissivity: v.emissivity },
  };
  const heatCapacityJPerM2K = v.C === b.C ? slabHeatCapacity(base) : v.C;
  // The heat store names the slab (it wins over the surface's shorthand); keep the shorthand equal to it.
  thermal.heatStore = { kind: "slab", heatCapacityJPerM2K };
  thermal.surface.heatCapacityJPerM2K = heatCapacityJPerM2K;
  const exchange = base.exchange ?? { recirculation: 0, coefficientWPerM2K: 0, weighting: "uniform" as const };
  // A recirculation set in the page replaces an exchange coefficient (the scenario takes one or the other).
  thermal.exchange = v.recirculation === b.recirculation ? exchange : { ...exchange, recirculation: v.recirculation, coefficientWPerM2K: 0 };
  const location = base.location ?? { latitudeRad: 0, longitudeRad: 0 };
  thermal.location = {
    latitudeRad: v.latitude === b.latitude ? location.latitudeRad : rad(v.latitude),
    longitudeRad: v.longitude === b.longitude ? location.longitudeRad : rad(v.longitude),
  };
  const baseSpin = base.spin ?? { rateRadPerSecond: (2 * Math.PI) / base.orbit.periodSeconds, ratio: { spin: 1, orbit: 1 }, obliquityRad: 0, equinoxTrueAnomalyRad: 0 };
  const parsed = parseSpin(v.spin);
  const obliquityRad = v.obliquity === b.obliquity ? baseSpin.obliquityRad : rad(v.obliquity);
  if ("ratio" in parsed) {
    thermal.spin = { ...baseSpin, obliquityRad, ratio: parsed.ratio, rateRadPerSecond: ((2 * Math.PI) / periodSeconds) * (parsed.ratio.spin / parsed.ratio.orbit) };
  } else if ("periodDays" in parsed) {
    const { ratio: _dropped, ...rest } = baseSpin;
    void _dropped;
    const rate = v.spin === b.spin ? baseSpin.rateRadPerSecond : (2 * Math.PI) / (parsed.periodDays * DAY_S);
    thermal.spin = { ...rest, obliquityRad, rateRadPerSecond: rate };
  } else {
    thermal.spin = { ...baseSpin, obliquityRad };
  }
  return thermal;
}
