/**
 * A scenario's `climate` key, validated by the schema, resolved to the zonal climate's settings in
 * SI with their defaults: 90 bands, North's D = 0.649 W m⁻² K⁻¹, blackbody outgoing radiation
 * with the body's emissivity, the body's albedo with no ice, the body's heat capacity in every
 * band, both starts, 360 steps per orbit.
 */
import { NORTH_DIFFUSION_W_PER_M2K, NORTH_ICE_ALBEDO, NORTH_ICE_EDGE_K, NORTH_OUTGOING_A_W_PER_M2, NORTH_OUTGOING_B_W_PER_M2K } from "../constants.js";
import { DEFAULT_STEP_RAMP_K, type AlbedoSpec } from "../physics/climateAlbedo.js";
import { spiegelSurface, type HeatCapacitySpec } from "../physics/climateHeatCapacity.js";
import type { OutgoingSpec } from "../physics/climateOutgoing.js";
import { DEFAULT_BANDS, DEFAULT_STEPS_PER_ORBIT, type ClimateSettings } from "../physics/climateSettings.js";
import type { ParsedScenario } from "./schema.js";

type ClimateInput = NonNullable<ParsedScenario["climate"]>;

export function resolveClimate(c: ClimateInput | undefined, body: { albedo: number; emissivity: number; heatCapacityJPerM2K: number }): ClimateSettings {
  const input = c ?? {};
  let outgoing: OutgoingSpec = { law: "blackbody", emissivity: body.emissivity };
  if (input.outgoing?.law === "linear") {
    outgoing = { law: "linear", aWPerM2: input.outgoing.a ?? NORTH_OUTGOING_A_W_PER_M2, bWPerM2K: input.outgoing.b ?? NORTH_OUTGOING_B_W_PER_M2K };
  } else if (input.outgoing?.law === "grey") {
    outgoing = input.outgoing.opticalDepth !== undefined ? { law: "grey", opticalDepth: input.outgoing.opticalDepth } : { law: "grey" };
  }
  let albedo: AlbedoSpec = { law: "constant", value: body.albedo, ...(input.albedo?.p2 !== undefined ? { p2: input.albedo.p2 } : {}) };
  if (input.albedo?.law === "step") {
    albedo = {
      law: "step",
      warm: body.albedo,
      ...(input.albedo.p2 !== undefined ? { warmP2: input.albedo.p2 } : {}),
      ice: input.albedo.ice ?? NORTH_ICE_ALBEDO,
      iceK: input.albedo.iceTemperature ?? NORTH_ICE_EDGE_K,
      rampK: input.albedo.ramp ?? DEFAULT_STEP_RAMP_K,
    };
  } else if (input.albedo?.law === "smooth") {
    albedo = { law: "smooth" };
  }
  let heatCapacity: HeatCapacitySpec = { kind: "slab", heatCapacityJPerM2K: body.heatCapacityJPerM2K };
  if (input.heatCapacity) {
    const spiegel = spiegelSurface(input.heatCapacity.oceanFraction);
    if (spiegel.kind === "surface") {
      const land = input.heatCapacity.landHeatCapacity ?? spiegel.landHeatCapacityJPerM2K;
      heatCapacity = {
        ...spiegel,
        landHeatCapacityJPerM2K: land,
        oceanHeatCapacityJPerM2K: input.heatCapacity.oceanHeatCapacity ?? (spiegel.oceanHeatCapacityJPerM2K / spiegel.landHeatCapacityJPerM2K) * land,
        freezing: input.heatCapacity.freezing ?? true,
      };
    }
  }
  return {
    bands: input.bands ?? DEFAULT_BANDS,
    diffusionWPerM2K: input.diffusion ?? NORTH_DIFFUSION_W_PER_M2K,
    outgoing,
    albedo,
    heatCapacity,
    start: input.start ?? "both",
    stepsPerOrbit: input.stepsPerOrbit ?? DEFAULT_STEPS_PER_ORBIT,
  };
}
