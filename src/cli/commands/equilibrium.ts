/** `calorbit equilibrium`: a quick equilibrium temperature from flags, with its Wien peak. */
import { Option, type Command } from "commander";
import { equilibriumTemperature, GEOMETRY_FACTOR, LUMPED_REGIMES, stellarFlux, wienPeakWavelengthM, type LumpedRegime } from "../../physics/flux.js";
import { luminosityFromRadiusTemperature } from "../../physics/star.js";
import { sig } from "../../report/format.js";
import { quantityFlag, usage } from "../flags.js";
import { bareLuminosityWarning } from "../../analysis/sanity.js";
import { VERSION } from "../../version.js";
import { out, warn } from "../output.js";

interface EquilibriumFlags {
  luminosity?: string;
  radius?: string;
  temperature?: string;
  distance: string;
  albedo: string;
  emissivity: string;
  regime: LumpedRegime;
  internalFlux: string;
  json?: boolean;
}

function equilibriumCommand(flags: EquilibriumFlags): void {
  const warnings: string[] = [];
  let luminosityW: number;
  if (flags.luminosity !== undefined) {
    if (flags.radius !== undefined || flags.temperature !== undefined) {
      throw usage("--luminosity", JSON.stringify(flags.luminosity), "either --luminosity or --radius with --temperature, not both");
    }
    luminosityW = quantityFlag("--luminosity", "luminosity", flags.luminosity);
    // A bare number is watts; "--luminosity 1" meant the Sun far more often than 1 W.
    if (/^\s*[+-]?[\d.]+([eE][+-]?\d+)?\s*$/.test(flags.luminosity)) {
      const w = bareLuminosityWarning("--luminosity", luminosityW);
      if (w !== undefined) warnings.push(w);
    }
  } else if (flags.radius !== undefined && flags.temperature !== undefined) {
    luminosityW = luminosityFromRadiusTemperature(
      quantityFlag("--radius", "length", flags.radius),
      quantityFlag("--temperature", "temperature", flags.temperature),
    );
  } else {
    throw usage("--luminosity", "missing", "a luminosity (e.g. 0.8Lsun), or --radius and --temperature");
  }
  if (!(luminosityW > 0)) throw usage("--luminosity", String(luminosityW), "a luminosity > 0 W");
  const distanceM = quantityFlag("--distance", "length", flags.distance);
  if (!(distanceM > 0)) throw usage("--distance", JSON.stringify(flags.distance), "a distance > 0 m");
  const albedo = Number(flags.albedo);
  if (!(albedo >= 0 && albedo <= 1)) throw usage("--albedo", JSON.stringify(flags.albedo), "a number with 0 ≤ A ≤ 1");
  const emissivity = Number(flags.emissivity);
  if (!(emissivity > 0 && emissivity <= 1)) throw usage("--emissivity", JSON.stringify(flags.emissivity), "a number with 0 < ε ≤ 1");
  const q = quantityFlag("--internal-flux", "flux", flags.internalFlux);
  if (!(q >= 0)) throw usage("--internal-flux", JSON.stringify(flags.internalFlux), "a flux ≥ 0 W/m2");
  const s = stellarFlux(luminosityW, distanceM);
  const absorbed = GEOMETRY_FACTOR[flags.regime] * (1 - albedo) * s + q;
  const t = equilibriumTemperature(absorbed, emissivity);
  for (const w of warnings) warn(w);
  if (flags.json) {
    const result = {
      regime: flags.regime,
      geometryFactor: GEOMETRY_FACTOR[flags.regime],
      luminosityW,
      distanceM,
      albedo,
      emissivity,
      internalFluxWPerM2: q,
      stellarFluxWPerM2: s,
      absorbedFluxWPerM2: absorbed,
      equilibriumK: t,
      wienPeakWavelengthM: wienPeakWavelengthM(t),
      warnings,
    };
    out(JSON.stringify({ calorbit: { version: VERSION }, ...result }, null, 2) + "\n");
    return;
  }
  out(
    [
      `stellar flux        ${s.toFixed(3)} W m⁻²`,
      `absorbed (${flags.regime}, f = ${GEOMETRY_FACTOR[flags.regime]})   ${absorbed.toFixed(3)} W m⁻²`,
      `equilibrium         ${t.toFixed(2)} K`,
      `Wien peak           ${sig(wienPeakWavelengthM(t) * 1e6, 4)} µm`,
    ].join("\n") + "\n",
  );
}

export function registerEquilibrium(program: Command): void {
  program
    .command("equilibrium")
    .description("quick equilibrium temperature from flags, with its Wien peak")
    .option("--luminosity <L>", "stellar luminosity (e.g. 0.8Lsun, 3e26W; a bare number is watts)")
    .option("--radius <R>", "stellar radius (e.g. 0.9Rsun), with --temperature")
    .option("--temperature <T>", "stellar effective temperature (e.g. 5300K)")
    .requiredOption("--distance <d>", "star–body distance (e.g. 0.7au)")
    .option("--albedo <A>", "Bond albedo", "0")
    .option("--emissivity <e>", "emissivity", "1")
    .option("--internal-flux <q>", "internal heat flux (e.g. 0.1W/m2)", "0")
    .option("--json", "print the result as one JSON document (SI units)")
    .addOption(new Option("--regime <name>", "heat-sharing regime").choices(LUMPED_REGIMES).default("global"))
    .addHelpText("after", `\nExample:\n  calorbit equilibrium --luminosity 1Lsun --distance 1au --albedo 0.3`)
    .action((flags: EquilibriumFlags) => equilibriumCommand(flags));
}
