/** The readable summary printed by `calorbit run` and `calorbit check`, units everywhere. */
import { heatStoreOf } from "../model/heatStore.js";
import { REGIME_TABLE } from "../model/regimes.js";
import type { ResolvedScenario } from "../scenario/resolve.js";
import type { TemperatureStats } from "../analysis/summarise.js";
import type { Simulation } from "../run/simulate.js";
import { VERSION } from "../version.js";
import { columnStepSeconds, cycleWords, lagWords } from "./wording.js";
import { ZERO_CELSIUS_K } from "../constants.js";
import { au, days, degrees, duration, fixed, sig, solarLuminosities, solarMasses } from "./format.js";

export const CAUTION = [
  "Caution: these are first-order estimates from a simplified thermal model. For spacecraft hardware,",
  "apply the margins of your organisation's thermal-control standard and verify with a qualified",
  "thermal model; nothing here replaces licensed engineering review.",
].join("\n");

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
  const store = heatStoreOf(thermal);
  switch (store.kind) {
    case "column": {
      const c = store.column;
      const p = c.properties;
      const heat = p.specificHeatPolynomial.length === 1 ? `c = ${sig(p.specificHeatPolynomial[0]!)} J kg⁻¹ K⁻¹` : "c(T) polynomial";
      lines.push(
        `  body      A = ${surface.albedo}${surface.albedoIncidence ? ` at normal incidence, A(θ) = A + ${surface.albedoIncidence.a} (θ/45°)³ + ${surface.albedoIncidence.b} (θ/90°)⁸` : ""}, ε = ${surface.emissivity}; a conduction column, interior flux ${sig(c.interiorFluxWPerM2)} W m⁻²`,
        `  column    ρ ${sig(p.densitySurface)} → ${sig(p.densityDeep)} kg m⁻³, k ${sig(p.conductivitySurface)} → ${sig(p.conductivityDeep)} W m⁻¹ K⁻¹${Number.isFinite(p.eFoldingDepthM) ? ` (e-folding ${sig(p.eFoldingDepthM)} m)` : ""}${p.radiativeChi ? `, χ = ${p.radiativeChi}` : ""}, ${heat}`,
      );
      break;
    }
    case "slab": {
      const origin = resolved.heatCapacityOrigin;
      const cText =
        origin.kind === "layer"
          ? ` (${origin.material}, ${sig(origin.thicknessM)} m: ρ = ${origin.densityKgPerM3} kg m⁻³, c = ${origin.specificHeatJPerKgK} J kg⁻¹ K⁻¹)`
          : "";
      lines.push(
        `  body      A = ${surface.albedo}${surface.albedoIncidence ? ` at normal incidence, A(θ) = A + ${surface.albedoIncidence.a} (θ/45°)³ + ${surface.albedoIncidence.b} (θ/90°)⁸` : ""}, ε = ${surface.emissivity}, C = ${sig(store.heatCapacityJPerM2K)} J m⁻² K⁻¹${cText}, q = ${sig(surface.internalFluxWPerM2)} W m⁻²`,
      );
      break;
    }
  }
  const entry = REGIME_TABLE[thermal.regime];
  const reads = (field: (typeof entry.fields)[number]) => entry.fields.includes(field);
  lines.push(`  regime    ${thermal.regime} (${entry.words})`);
  if (reads("exchange")) {
    const ex = thermal.exchange ?? { recirculation: 0, coefficientWPerM2K: 0, weighting: "uniform" };
    const how = ex.coefficientWPerM2K > 0 ? `exchange coefficient k = ${sig(ex.coefficientWPerM2K)} W m⁻² K⁻¹` : `recirculation efficiency ${ex.recirculation}`;
    lines.push(`  exchange  ${how}; ${ex.weighting === "flux" ? "flux-weighted dayside (f = 2/3)" : "uniform dayside (f = 1/2)"}`);
  }
  const spin = thermal.spin;
  if (reads("spin.rate")) {
    const spinText = !spin
      ? "synchronous (1:1), obliquity 0°"
      : `${spin.ratio ? `${spin.ratio.spin}:${spin.ratio.orbit} spin–orbit` : `sidereal period ${duration((2 * Math.PI) / spin.rateRadPerSecond)}`}, obliquity ${sig(degrees(spin.obliquityRad))}°, equinox at true anomaly ${sig(degrees(spin.equinoxTrueAnomalyRad))}°`;
    lines.push(`  spin      ${spinText}`);
  } else if (reads("spin.axis")) {
    lines.push(`  axis      obliquity ${sig(degrees(spin?.obliquityRad ?? 0))}°, equinox at true anomaly ${sig(degrees(spin?.equinoxTrueAnomalyRad ?? 0))}°`);
  }
  if (reads("location.latitude")) {
    const loc = thermal.location ?? { latitudeRad: 0, longitudeRad: 0 };
    lines.push(`  place     latitude ${sig(degrees(loc.latitudeRad))}°${reads("location.longitude") ? `, longitude ${sig(degrees(loc.longitudeRad))}°` : ""}`);
  }
  if (thermal.windowK) lines.push(`  window    ${fixed(thermal.windowK[0], 2)} K to ${fixed(thermal.windowK[1], 2)} K`);
  return lines;
}

/** Text report options: `celsius` adds the temperature rows and the window again in °C. */
export interface SummaryTextOptions {
  celsius?: boolean;
}

export function summaryText(resolved: ResolvedScenario, sim: Simulation, options: SummaryTextOptions = {}): string {
  const { summary: s, solver } = sim;
  const P = s.periodSeconds;
  const lines: string[] = [`calorbit ${VERSION} — ${resolved.thermal.name}`, ...describeScenario(resolved), ""];
  const heading: Record<typeof solver.mode, string> = {
    periodic: "Periodic steady state",
    seasonal: s.seasonal
      ? `Seasonal cycle (spin not commensurate with the orbit: ${solver.orbitsIntegrated} orbits integrated from the first guess; statistics over the last ${s.seasonal.orbits}, the beat of spin and orbit, whose orbit means range from ${fixed(s.seasonal.orbitMeanK.minK, 2)} K to ${fixed(s.seasonal.orbitMeanK.maxK, 2)} K; no cycle closes exactly, so neither does the energy budget)`
      : `Seasonal cycle (spin not commensurate with the orbit)`,
    transient: `Transient from ${fixed(sim.series.temperatureK[0]!, 2)} K over ${solver.orbitsIntegrated} orbits (statistics of the last orbit)`,
  };
  lines.push(heading[solver.mode]);
  const row = (label: string, t: TemperatureStats) =>
    `  ${label.padEnd(13)}${fixed(t.minK, 2).padStart(10)} K${fixed(t.maxK, 2).padStart(10)} K${fixed(t.meanK, 2).padStart(10)} K${fixed(t.swingK, 2).padStart(9)} K`;
  lines.push(`  ${"".padEnd(13)}${"min".padStart(12)}${"max".padStart(12)}${"mean".padStart(12)}${"swing".padStart(11)}`);
  // A swing is a difference, the same number in K and °C; min, max and mean shift by 273.15.
  const rowC = (label: string, t: TemperatureStats) =>
    `  ${label.padEnd(13)}${fixed(t.minK - ZERO_CELSIUS_K, 2).padStart(9)} °C${fixed(t.maxK - ZERO_CELSIUS_K, 2).padStart(9)} °C${fixed(t.meanK - ZERO_CELSIUS_K, 2).padStart(9)} °C${fixed(t.swingK, 2).padStart(8)} °C`;
  const rows: [string, TemperatureStats][] =
    s.day && s.night
      ? [["day", s.day.temperature], ["day T_eq", s.day.equilibrium], ["night", s.night.temperature], ["night T_eq", s.night.equilibrium]]
      : [[s.depthProfile ? "surface" : "temperature", s.temperature], ["equilibrium", s.equilibrium]];
  for (const [label, t] of rows) lines.push(row(label, t));
  if (options.celsius) for (const [label, t] of rows) lines.push(rowC(label, t));
  if (s.solarDaySeconds !== undefined) {
    lines.push(`  solar day   ${s.solarDaySeconds === null ? "none (synchronous spin)" : `${duration(s.solarDaySeconds)} (${sig(s.solarDaySeconds / P, 4)} orbits)`}`);
  }
  if (s.cycleSeconds > P * 1.000001) lines.push(`  cycle       ${sig(s.cycleSeconds / P, 3)} orbits (the spin–orbit resonance repeats)`);
  // A lag that would print as 0.000, a flat temperature called "circular", a multi-orbit cycle called "the orbit": words that say what the number is.
  lines.push(`  lag of maximum after periastron   ${lagWords(s, resolved.thermal.orbit.eccentricity, columnStepSeconds(s, solver))}`);
  lines.push(
    s.dampingRatio === null
      ? `  damping ratio (T swing / Teq swing)   none (${s.notes?.dampingRatio ?? "not defined here"})`
      : `  damping ratio (T swing / Teq swing)   ${fixed(s.dampingRatio, 4)}${s.day ? " (dayside)" : ""}`,
  );
  if (s.radiativeTimeSeconds !== null && s.tauOverPeriod !== null) {
    lines.push(`  radiative time τ = C/(4εσT³)   ${duration(s.radiativeTimeSeconds)}, τ/P = ${sig(s.tauOverPeriod)}`);
  }
  if (s.skinDepths && s.thermalInertiaSurface !== undefined) {
    lines.push(
      `  column      ${solver.layers} layers; thermal inertia at the surface ${sig(s.thermalInertiaSurface)} J m⁻² K⁻¹ s⁻½`,
      `  skin depth  ${s.skinDepths.diurnalM !== null ? `diurnal ${sig(s.skinDepths.diurnalM)} m, ` : ""}orbital ${sig(s.skinDepths.orbitalM)} m`,
    );
  }
  if (s.timeInRange) {
    const w = s.timeInRange;
    lines.push(
      `  time in ${fixed(w.lowK, 2)}–${fixed(w.highK, 2)} K${options.celsius ? ` (${fixed(w.lowK - ZERO_CELSIUS_K, 2)}–${fixed(w.highK - ZERO_CELSIUS_K, 2)} °C)` : ""}   ${fixed(100 * w.fraction, 2)} % ${cycleWords(P, s.cycleSeconds)} (${duration(w.seconds)})`,
    );
  }
  if (s.meanAbsorbedWPerM2 !== null && s.meanEmittedWPerM2 !== null && s.energyBalanceResidual !== null) {
    const interior = s.depthProfile ? " (with interior flux)" : "";
    lines.push(
      `  energy   absorbed ${fixed(s.meanAbsorbedWPerM2, 3)} W m⁻²${interior}, emitted ${fixed(s.meanEmittedWPerM2, 3)} W m⁻², residual ${s.energyBalanceResidual.toExponential(1)}`,
    );
  } else if (s.day && s.night) {
    lines.push(
      `  energy   per hemisphere: day absorbs ${fixed(s.day.meanAbsorbedWPerM2, 3)} W m⁻², night ${fixed(s.night.meanAbsorbedWPerM2, 3)} W m⁻²; no whole-body budget (${s.notes?.energyBalanceResidual ?? ""})`,
    );
  } else {
    lines.push(`  energy   no balance residual (${s.notes?.energyBalanceResidual ?? "not a budget"})`);
  }
  const wien = (m: number | null) => (m === null ? "none (0 K)" : `${sig(m * 1e6, 4)} µm`);
  lines.push(`  Wien peak   ${wien(s.wienPeakAtMaxM)} at T max, ${wien(s.wienPeakAtMinM)} at T min`);
  if (s.night && s.night.temperature.maxK === 0) {
    lines.push("  night side  0 K throughout: no recirculation, no exchange coefficient and no internal flux carry heat to it (the no-redistribution limit)");
  }
  if (solver.integrator === "crank-nicolson") {
    lines.push(
      `  solver   Crank–Nicolson, ${solver.stepsPerCycle} steps per cycle, ${solver.iterations} cycles to the periodic state, ${solver.orbitsIntegrated} orbits integrated (periodicity residual ${(solver.periodicityResidual ?? NaN).toExponential(1)} ≤ tolerance ${solver.requestedTolerance.toExponential()})`,
    );
  } else {
    const shooting = solver.mode === "periodic" ? `${solver.iterations} shooting iterations, ` : "";
    lines.push(
      `  solver   ${solver.integrator}, ${shooting}${solver.orbitsIntegrated} orbits integrated, ${solver.steps} steps, ${solver.evaluations} evaluations, tolerance ${solver.requestedTolerance.toExponential()}`,
    );
  }
  if (s.depthProfile) {
    lines.push("", "Depth profile", "     depth         min         max        mean");
    const rows = s.depthProfile;
    const stride = Math.max(1, Math.ceil(rows.length / 16));
    rows.forEach((r, i) => {
      if (i % stride === 0 || i === rows.length - 1) {
        lines.push(`  ${sig(r.depthM, 3).padStart(8)} m ${fixed(r.minK, 2).padStart(9)} K ${fixed(r.maxK, 2).padStart(9)} K ${fixed(r.meanK, 2).padStart(9)} K`);
      }
    });
  }
  lines.push("", CAUTION);
  return lines.join("\n") + "\n";
}
