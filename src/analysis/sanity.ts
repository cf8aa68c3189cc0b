/**
 * Physical sanity of a result: things that are possible to compute but that a person should be
 * told about. Each check returns warning sentences; the CLI prints them on stderr and lists them in
 * the JSON result (`warnings`). Pure: no I/O.
 */
import { SOLAR_LUMINOSITY_W, STEFAN_BOLTZMANN } from "../constants.js";
import type { ThermalCase } from "../model/thermalCase.js";

/** The faintest stars and brown dwarfs are about 1e-5 L☉; a luminosity below 1e-6 L☉ is not a star's. */
export const FAINTEST_STAR_LSUN = 1e-6;
/** Relative slack before a periodic temperature counts as outside its equilibrium range (solver tolerance). */
const RANGE_SLACK = 1e-6;

/** The star's effective temperature, K, when it is given or follows from L and R; undefined otherwise. */
export function starTemperatureK(star: ThermalCase["star"]): number | undefined {
  if (star.effectiveTemperatureK !== undefined) return star.effectiveTemperatureK;
  if (star.radiusM !== undefined && star.radiusM > 0) return (star.luminosityW / (4 * Math.PI * star.radiusM ** 2 * STEFAN_BOLTZMANN)) ** 0.25;
  return undefined;
}

/** A luminosity given as a bare number (read as watts) that no star has: the usual slip for "1 Lsun". */
export function bareLuminosityWarning(field: string, luminosityW: number): string | undefined {
  if (!(luminosityW < FAINTEST_STAR_LSUN * SOLAR_LUMINOSITY_W)) return undefined;
  // 1e20, not 100000000000000000000: a long number is shown as a person writes it.
  const shown = Math.abs(luminosityW) >= 1e6 ? luminosityW.toExponential() : String(luminosityW);
  return `${field}: ${shown} was read as ${shown} W, far below any star's (the faintest are about 1e-5 Lsun); for solar units write "${shown} Lsun"`;
}

interface TemperatureRange {
  minK: number;
  maxK: number;
}

/**
 * Warnings on a finished run: a temperature above the star's own, and (for a one-state periodic
 * result) a temperature outside the equilibrium range, which the energy balance forbids.
 */
export function resultWarnings(
  thermal: ThermalCase,
  summary: { temperature: TemperatureRange; equilibrium: TemperatureRange },
  options: { periodic: boolean; singleState: boolean },
): string[] {
  const warnings: string[] = [];
  const starK = starTemperatureK(thermal.star);
  if (starK !== undefined && summary.temperature.maxK > starK) {
    warnings.push(`the maximum temperature ${summary.temperature.maxK.toFixed(2)} K is above the star's own ${starK.toFixed(0)} K, which no body heated by that star can reach: check the orbit (periastron ${(thermal.orbit.semiMajorAxisM * (1 - thermal.orbit.eccentricity)).toPrecision(4)} m) and the star`);
  }
  if (options.periodic && options.singleState) {
    const { temperature: t, equilibrium: eq } = summary;
    const above = t.maxK > eq.maxK * (1 + RANGE_SLACK);
    const below = t.minK < eq.minK * (1 - RANGE_SLACK);
    if (above || below) {
      warnings.push(
        `the temperature range ${t.minK.toFixed(2)}–${t.maxK.toFixed(2)} K leaves the equilibrium range ${eq.minK.toFixed(2)}–${eq.maxK.toFixed(2)} K, which a periodic slab cannot do: this result is not trustworthy (try a smaller --tolerance or more --samples, and report it)`,
      );
    }
  }
  return warnings;
}
