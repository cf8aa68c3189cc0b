/**
 * The live view's state as a query string, so that a link reproduces the view: every parameter is
 * written as the exact number the page computes with, so a shared link computes the same case.
 * Pure: the page reads and writes `location` itself.
 */
import { SURFACE_REGIMES, type Regime } from "../model/regimes.js";
import type { XAxis } from "./chartData.js";
import { PARAMETERS, type ParameterValues } from "./parameters.js";

export const X_AXES: readonly XAxis[] = ["time", "meanAnomaly", "trueAnomaly"];

export interface ViewState {
  values: ParameterValues;
  x: XAxis;
  overlay: boolean;
}

export function encodeViewState(s: ViewState): string {
  const q = new URLSearchParams();
  for (const p of PARAMETERS) q.set(p.key, String(s.values[p.key]));
  q.set("spin", s.values.spin);
  q.set("regime", s.values.regime);
  q.set("x", s.x);
  q.set("overlay", s.overlay ? "1" : "0");
  return q.toString();
}

/** The state a query string describes; anything missing or unreadable keeps the initial state's value. */
export function decodeViewState(query: string, initial: ViewState): ViewState {
  const q = new URLSearchParams(query);
  const num = (k: string): number | undefined => {
    const raw = q.get(k);
    const v = raw === null || raw.trim() === "" ? NaN : Number(raw);
    return Number.isFinite(v) ? v : undefined;
  };
  const values = { ...initial.values };
  for (const p of PARAMETERS) {
    const v = num(p.key);
    if (v !== undefined && p.allows(v)) values[p.key] = v;
  }
  // Links written before the exact values: logC and logA held log10 of C and of a in au.
  const logC = num("logC");
  if (num("C") === undefined && logC !== undefined) values.C = 10 ** logC;
  const logA = num("logA");
  if (num("a") === undefined && logA !== undefined) values.a = 10 ** logA;
  const spin = q.get("spin");
  if (spin !== null && spin.trim() !== "") values.spin = spin;
  const regime = q.get("regime");
  if (regime !== null && (SURFACE_REGIMES as readonly string[]).includes(regime)) values.regime = regime as Regime;
  const x = q.get("x");
  const overlay = q.get("overlay");
  return {
    values,
    x: x !== null && (X_AXES as readonly string[]).includes(x) ? (x as XAxis) : initial.x,
    overlay: overlay === null ? initial.overlay : overlay === "1",
  };
}
