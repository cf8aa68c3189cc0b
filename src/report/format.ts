/** Number formatting at the report edge: SI inside, readable units outside. */
import { ASTRONOMICAL_UNIT_M, DAY_S, SOLAR_LUMINOSITY_W, SOLAR_MASS_KG } from "../constants.js";

export function fixed(x: number, digits: number): string {
  return Number.isFinite(x) ? x.toFixed(digits) : String(x);
}

/** Three significant figures, switching to exponent form outside [1e-3, 1e6). */
export function sig(x: number, digits = 3): string {
  if (x === 0 || !Number.isFinite(x)) return String(x);
  const a = Math.abs(x);
  return a >= 1e-3 && a < 1e6 ? String(Number(x.toPrecision(digits))) : x.toExponential(digits - 1);
}

export const au = (m: number) => m / ASTRONOMICAL_UNIT_M;
export const days = (s: number) => s / DAY_S;
export const solarLuminosities = (w: number) => w / SOLAR_LUMINOSITY_W;
export const solarMasses = (kg: number) => kg / SOLAR_MASS_KG;
export const degrees = (rad: number) => (rad * 180) / Math.PI;

/** A duration in the most readable of s, h, d. */
export function duration(seconds: number): string {
  const a = Math.abs(seconds);
  if (a < 600) return `${sig(seconds)} s`;
  if (a < 2 * DAY_S) return `${sig(seconds / 3600)} h`;
  return `${sig(seconds / DAY_S)} d`;
}
