/** The readable summary printed by `calorbit run` and `calorbit check`, units everywhere. */
import { GEOMETRY_FACTOR, type LumpedRegime } from "../physics/flux.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import type { Simulation } from "../simulate.js";
import { VERSION } from "../version.js";
import { au, days, degrees, duration, fixed, sig, solarLuminosities, solarMasses } from "./format.js";

export const CAUTION = [
  "Caution: these are first-order estimates from a lumped energy balance. For spacecraft hardware,",
  "apply the margins of your organisation's thermal-control standard and verify with a qualified",
  "thermal model; nothing here replaces licensed engineering review.",
].join("\n");

const REGIME_WORDS: Record<LumpedRegime, string> = {
  global: "fast rotator, heat shared over the whole sphere",
  dayside: "locked dayside, no heat carried to the night side",
  substellar: "the point under the star",
};

function fraction(f: number): string {
  return f === 0.25 ? "1/4" : f === 0.5 ? "1/2" : String(f);
}

/** The scenario as understood, in units a person reads. */
export function describeScenario(resolved: ResolvedScenario): string[] {
  const { thermal } = resolved;
  const { star, orbit, surface } = thermal;
  const lines: string[] = [];
  const massText = Number.isFinite(star.massKg) ? `, M = ${sig(solarMasses(star.massKg))} M☉` : "";
  const fromRT =
    star.radiusM !== undefined && star.effectiveTemperatureK !== undefined
      ? ` from R = ${sig(star.radiusM)} m and T = ${sig(star.effectiveTemperatureK, 4)} K`
      : "";
  lines.push(`  star      L = ${sig(solarLuminosities(star.luminosityW))} L☉ (${sig(star.luminosityW)} W)${fromRT}${massText}`);
  const periodWhy = resolved.periodOrigin === "kepler" ? "Kepler's third law" : "given";
  const start =
    orbit.meanAnomalyAtStartRad === 0 ? "start at periastron" : `start at mean anomaly ${sig(degrees(orbit.meanAnomalyAtStartRad))}°`;
  lines.push(
    `  orbit     a = ${sig(au(orbit.semiMajorAxisM), 4)} au, e = ${orbit.eccentricity}, P = ${sig(days(orbit.periodSeconds), 5)} d (${periodWhy}), ${start}`,
  );
  const origin = resolved.heatCapacityOrigin;
  const cText =
    origin.kind === "layer"
      ? ` (${origin.material}, ${sig(origin.thicknessM)} m: ρ = ${origin.densityKgPerM3} kg m⁻³, c = ${origin.specificHeatJPerKgK} J kg⁻¹ K⁻¹)`
      : "";
  lines.push(
    `  body      A = ${surface.albedo}, ε = ${surface.emissivity}, C = ${sig(surface.heatCapacityJPerM2K)} J m⁻² K⁻¹${cText}, q = ${sig(surface.internalFluxWPerM2)} W m⁻²`,
  );
  lines.push(`  regime    ${thermal.regime} (f = ${fraction(GEOMETRY_FACTOR[thermal.regime])}: ${REGIME_WORDS[thermal.regime]})`);
  if (thermal.windowK) lines.push(`  window    ${fixed(thermal.windowK[0], 2)} K to ${fixed(thermal.windowK[1], 2)} K`);
  return lines;
}

export function summaryText(resolved: ResolvedScenario, sim: Simulation): string {
  const { summary: s, solver } = sim;
  const P = s.periodSeconds;
  const lines: string[] = [`calorbit ${VERSION} — ${resolved.thermal.name}`, ...describeScenario(resolved), ""];
  lines.push(
    solver.mode === "periodic"
      ? "Periodic steady state (one orbit)"
      : `Transient from ${fixed(sim.series.temperatureK[0]!, 2)} K over ${solver.orbitsIntegrated} orbits (statistics of the last orbit)`,
  );
  const row = (label: string, t: { minK: number; maxK: number; meanK: number; swingK: number }) =>
    `  ${label.padEnd(13)}${fixed(t.minK, 2).padStart(10)} K${fixed(t.maxK, 2).padStart(10)} K${fixed(t.meanK, 2).padStart(10)} K${fixed(t.swingK, 2).padStart(9)} K`;
  lines.push(`  ${"".padEnd(13)}${"min".padStart(12)}${"max".padStart(12)}${"mean".padStart(12)}${"swing".padStart(11)}`);
  lines.push(row("temperature", s.temperature));
  lines.push(row("equilibrium", s.equilibrium));
  lines.push(
    s.lagSeconds === null
      ? "  lag of maximum after periastron   none (circular orbit)"
      : `  lag of maximum after periastron   ${duration(s.lagSeconds)} (${fixed(s.lagSeconds / P, 3)} of the orbit)`,
  );
  lines.push(`  damping ratio (T swing / Teq swing)   ${fixed(s.dampingRatio, 4)}`);
  lines.push(`  radiative time τ = C/(4εσT³)   ${duration(s.radiativeTimeSeconds)}, τ/P = ${sig(s.tauOverPeriod)}`);
  if (s.timeInRange) {
    const w = s.timeInRange;
    lines.push(
      `  time in ${fixed(w.lowK, 2)}–${fixed(w.highK, 2)} K   ${fixed(100 * w.fraction, 2)} % of the orbit (${duration(w.seconds)})`,
    );
  }
  lines.push(
    `  energy   absorbed ${fixed(s.meanAbsorbedWPerM2, 3)} W m⁻², emitted ${fixed(s.meanEmittedWPerM2, 3)} W m⁻², residual ${s.energyBalanceResidual.toExponential(1)}`,
  );
  lines.push(`  Wien peak   ${sig(s.wienPeakAtMaxM * 1e6, 4)} µm at T max, ${sig(s.wienPeakAtMinM * 1e6, 4)} µm at T min`);
  const shooting = solver.mode === "periodic" ? `${solver.iterations} shooting iterations, ` : "";
  lines.push(
    `  solver   ${solver.integrator}, ${shooting}${solver.orbitsIntegrated} orbits integrated, ${solver.steps} steps, ${solver.evaluations} evaluations, tolerance ${solver.requestedTolerance}`,
  );
  lines.push("", CAUTION);
  return lines.join("\n") + "\n";
}
