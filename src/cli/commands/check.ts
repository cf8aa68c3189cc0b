/** `calorbit check`: validate a scenario and print what was understood, with the derived period and τ/P. */
import type { Command } from "commander";
import { out } from "../output.js";

async function checkCommand(scenarioPath: string): Promise<void> {
  const [{ specificHeatAt }, { duration, sig }, { describeScenario }, { buildThermalModel }, { loadScenario }, { refuseDarkness }, { REGIME_TABLE }] = await Promise.all([
    import("../../physics/column.js"),
    import("../../report/format.js"),
    import("../../report/text.js"),
    import("../../model/build.js"),
    import("../io.js"),
    import("../../scenario/physical.js"),
    import("../../model/regimes.js"),
  ]);
  const { resolved, file } = loadScenario(scenarioPath);
  const { thermal } = resolved;
  // The map and zonal pipelines solve cell by cell or band by band: no single-surface model to describe.
  const pipeline = REGIME_TABLE[thermal.regime].pipeline;
  if (pipeline !== "surface") {
    const grid = pipeline === "map" && thermal.map ? `map of ${thermal.map.longitudes} × ${thermal.map.latitudes} cells, each solved alone` : `zonal climate of ${thermal.climate?.bands ?? "its"} latitude bands`;
    out(
      [
        `${file}: valid scenario "${thermal.name}"`,
        ...describeScenario(resolved),
        `  derived   period ${duration(thermal.orbit.periodSeconds)} (${sig(thermal.orbit.periodSeconds, 6)} s); ${grid}`,
      ].join("\n") + "\n",
    );
    return;
  }
  refuseDarkness(thermal);
  const model = buildThermalModel(thermal);
  const lines = [
    `${file}: valid scenario "${thermal.name}"`,
    ...describeScenario(resolved),
    `  derived   period ${duration(thermal.orbit.periodSeconds)} (${sig(thermal.orbit.periodSeconds, 6)} s), equilibrium of the cycle-mean flux ${model.meanFluxEquilibriumK.toFixed(2)} K,`,
  ];
  if (model.kind === "column") {
    const p = model.heatStore.column.properties;
    const c = specificHeatAt(p, model.meanFluxEquilibriumK);
    lines.push(`            conduction column: thermal inertia at the surface ${sig(Math.sqrt(p.conductivitySurface * p.densitySurface * c))} J m⁻² K⁻¹ s⁻½ (at ${model.meanFluxEquilibriumK.toFixed(0)} K)`);
  } else {
    const tau = model.radiativeTimeSeconds;
    lines.push(`            radiative time τ = ${duration(tau)}, τ/P = ${sig(tau / thermal.orbit.periodSeconds)}`);
  }
  if (model.solarDaySeconds !== undefined) {
    lines.push(`            solar day ${model.solarDaySeconds === null ? "none (synchronous)" : duration(model.solarDaySeconds)}, cycle ${model.cycleOrbits} orbit(s)${model.commensurate ? "" : " (not commensurate: seasonal convergence)"}`);
  }
  out(lines.join("\n") + "\n");
}

export function registerCheck(program: Command): void {
  program
    .command("check")
    .description("validate a scenario and print what calorbit understood, with units, the period and τ/P")
    .argument("<scenario>", "scenario file (YAML or JSON)")
    .action((scenario: string) => checkCommand(scenario));
}
