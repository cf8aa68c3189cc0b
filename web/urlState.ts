/**
 * The live view's state and its place in the URL: the address holds the parameters, the regime, the x
 * axis and the overlay, so a link shares the view.
 */
import { slabHeatCapacity } from "../src/model/heatStore.js";
import { ASTRONOMICAL_UNIT_M } from "../src/constants.js";
import type { Regime, ThermalCase } from "../src/model/thermalCase.js";
import type { XAxis } from "../src/view/chartData.js";

export interface ViewState {
  e: number;
  albedo: number;
  emissivity: number;
  log10C: number;
  log10A: number; // semi-major axis, log10 au
  regime: Regime;
  x: XAxis;
  overlay: boolean;
}

export function stateFromCase(c: ThermalCase): ViewState {
  return {
    e: c.orbit.eccentricity,
    albedo: c.surface.albedo,
    emissivity: c.surface.emissivity,
    log10C: Math.log10(slabHeatCapacity(c)),
    log10A: Math.log10(c.orbit.semiMajorAxisM / ASTRONOMICAL_UNIT_M),
    regime: c.regime,
    x: "time",
    overlay: false,
  };
}

export function readUrl(base: ViewState): ViewState {
  const q = new URLSearchParams(location.search);
  const num = (k: string, d: number) => (q.has(k) && Number.isFinite(Number(q.get(k))) ? Number(q.get(k)) : d);
  return {
    e: num("e", base.e),
    albedo: num("albedo", base.albedo),
    emissivity: num("emissivity", base.emissivity),
    log10C: num("logC", base.log10C),
    log10A: num("logA", base.log10A),
    regime: (q.get("regime") as Regime | null) ?? base.regime,
    x: (q.get("x") as XAxis | null) ?? base.x,
    overlay: q.get("overlay") === "1" || (q.get("overlay") === null && base.overlay),
  };
}

export function writeUrl(s: ViewState): void {
  const q = new URLSearchParams({
    e: s.e.toFixed(3),
    albedo: s.albedo.toFixed(3),
    emissivity: s.emissivity.toFixed(3),
    logC: s.log10C.toFixed(3),
    logA: s.log10A.toFixed(4),
    regime: s.regime,
    x: s.x,
    overlay: s.overlay ? "1" : "0",
  });
  history.replaceState(null, "", `${location.pathname}?${q.toString()}`);
}

