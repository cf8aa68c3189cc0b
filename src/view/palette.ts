/**
 * calorbit's chart colours: the Okabe–Ito colour-blind-safe palette (Okabe & Ito 2008), one
 * definition for the SVG export and the browser viewer.
 */
import { REGIMES, REGIME_TABLE, type Regime } from "../model/regimes.js";

export const OKABE_ITO = {
  blue: "#0072B2",
  vermillion: "#D55E00",
  bluishGreen: "#009E73",
  orange: "#E69F00",
  skyBlue: "#56B4E9",
  reddishPurple: "#CC79A7",
  yellow: "#F0E442",
  black: "#000000",
} as const;

/** What each colour means in calorbit's charts. */
export const CHART_COLOURS = {
  temperature: OKABE_ITO.blue,
  equilibrium: OKABE_ITO.vermillion,
  night: OKABE_ITO.skyBlue,
  window: OKABE_ITO.bluishGreen,
  marker: OKABE_ITO.reddishPurple,
  grey: "#555555",
} as const;

/** One colour per regime when several are drawn together: from the regimes table. */
export const REGIME_COLOURS: Readonly<Record<Regime, string>> = Object.fromEntries(REGIMES.map((r) => [r, REGIME_TABLE[r].colour])) as Record<Regime, string>;

/** A cycle of distinct colours for families of curves. */
export const SERIES_CYCLE = Object.values(OKABE_ITO);

/**
 * Colours for regimes drawn over a chart whose own curves already use `reserved`: each regime keeps
 * its own colour when that is free, and otherwise takes the first palette colour nobody uses, so no
 * two curves share a colour (up to the palette's eight).
 */
export function overlayColours(regimes: readonly string[], reserved: readonly string[]): string[] {
  const used = new Set(reserved.map((c) => c.toUpperCase()));
  return regimes.map((r) => {
    const own = (REGIME_COLOURS as Readonly<Record<string, string>>)[r];
    const colour = own !== undefined && !used.has(own.toUpperCase()) ? own : (SERIES_CYCLE.find((c) => !used.has(c.toUpperCase())) ?? CHART_COLOURS.grey);
    used.add(colour.toUpperCase());
    return colour;
  });
}

/** The one colour ramp of calorbit's maps (heat maps, surface maps, in the SVG and the viewer): deep blue through teal to light yellow, perceptually ordered and colour-blind safe. */
const RAMP = [
  [13, 42, 110],
  [0, 114, 178],
  [0, 158, 115],
  [160, 200, 80],
  [240, 228, 66],
] as const;

/** The ramp's colour at f in [0, 1] (clamped), as #rrggbb. */
export function rampColour(f: number): string {
  const x = Math.min(1, Math.max(0, f)) * (RAMP.length - 1);
  const i = Math.min(RAMP.length - 2, Math.floor(x));
  const t = x - i;
  const a = RAMP[i]!;
  const b = RAMP[i + 1]!;
  const channel = (k: number) => Math.round(a[k]! + t * (b[k]! - a[k]!)).toString(16).padStart(2, "0");
  return `#${channel(0)}${channel(1)}${channel(2)}`;
}
