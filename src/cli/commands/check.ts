/** `calorbit check`: validate a scenario and print what was understood, with the derived period and τ/P. */
import type { Command } from "commander";
import { specificHeatAt } from "../../physics/column.js";
import { duration, sig } from "../../report/format.js";
import { describeScenario } from "../../report/text.js";
import { buildThermalModel } from "../../thermalModel.js";
import { loadScenario } from "../io.js";

function checkCommand(scenarioPath: string): void {
  const { resolved, file } = loadScenario(scenarioPath);
  const { thermal } = resolved;
  const model = buildThermalModel(thermal);
  const tau = model.radiativeTimeSeconds;
  const lines = [
    `${file}: valid scenario "${thermal.name}"`,
    ...describeScenario(resolved),
    `  derived   period ${duration(thermal.orbit.periodSeconds)} (${sig(thermal.orbit.periodSeconds, 6)} s), equilibrium of the cycle-mean flux ${model.meanFluxEquilibriumK.toFixed(2)} K,`,
  ];
  if (thermal.column) {
    const p = thermal.column.properties;
    const c = specificHeatAt(p, model.meanFluxEquilibriumK);
    lines.push(`            conduction column: thermal inertia at the surface ${sig(Math.sqrt(p.conductivitySurface * p.densitySurface * c))} J m⁻² K⁻¹ s⁻½ (at ${model.meanFluxEquilibriumK.toFixed(0)} K)`);
  } else {
    lines.push(`            radiative time τ = ${duration(tau)}, τ/P = ${sig(tau / thermal.orbit.periodSeconds)}`);
  }
  if (model.solarDaySeconds !== undefined) {
    lines.push(`            solar day ${model.solarDaySeconds === null ? "none (synchronous)" : duration(model.solarDaySeconds)}, cycle ${model.cycleOrbits} orbit(s)${model.commensurate ? "" : " (not commensurate: seasonal convergence)"}`);
  }
  process.stdout.write(lines.join("\n") + "\n");
}

export function registerCheck(program: Command): void {
  program
    .command("check")
    .description("validate a scenario and print what calorbit understood, with units, the period and τ/P")
    .argument("<scenario>", "scenario file (YAML or JSON)")
    .action((scenario: string) => checkCommand(scenario));
}
