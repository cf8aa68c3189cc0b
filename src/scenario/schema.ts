/**
 * The scenario file format, as a zod schema: the single definition from which validation,
 * the SI conversion of dimensional values and the published JSON Schema all come.
 * Every object is strict (unknown keys are errors) and every message says what is allowed.
 */
import { z } from "zod";
import { REGIMES } from "../model/thermalCase.js";
import { DAYSIDE_WEIGHTINGS } from "../physics/dayNight.js";
import { MATERIAL_NAMES } from "../physics/materials.js";
import { ALBEDO_LAWS } from "../physics/climateAlbedo.js";
import { OUTGOING_LAWS } from "../physics/climateOutgoing.js";
import { CLIMATE_STARTS } from "../physics/climateSettings.js";
import { bareUnit, parseQuantity, UNIT_TABLES, type QuantityKind } from "./units.js";

/** A dimensional value: SI number or "<number> <unit>", converted to SI, with an optional range check. */
function quantity(kind: QuantityKind, description: string, check?: { ok: (si: number) => boolean; allowed: string }) {
  return z
    .union([z.number(), z.string()], { error: `a number in ${bareUnit(kind)} or a string "<number> <unit>"` })
    .transform((raw, ctx) => {
      const parsed = parseQuantity(kind, raw);
      if (!parsed.ok) {
        ctx.issues.push({ code: "custom", message: parsed.allowed, input: raw });
        return z.NEVER;
      }
      if (check && !check.ok(parsed.valueSI)) {
        ctx.issues.push({ code: "custom", message: check.allowed, input: raw });
        return z.NEVER;
      }
      return parsed.valueSI;
    })
    .describe(
      UNIT_TABLES[kind].bare === undefined
        ? `${description} (SI unit ${UNIT_TABLES[kind].si}; or a string such as "1.2 ${Object.keys(UNIT_TABLES[kind].units).at(-1)}")`
        : `${description} (a bare number is in ${bareUnit(kind)}; or a string such as "1.2 ${UNIT_TABLES[kind].si}")`,
    );
}

const positive = (unit: string) => ({ ok: (v: number) => v > 0, allowed: `a value > 0 ${unit}` });
const nonNegative = (unit: string) => ({ ok: (v: number) => v >= 0, allowed: `a value ≥ 0 ${unit}` });

function boundedNumber(description: string, ok: (v: number) => boolean, allowed: string) {
  return z
    .number({ error: allowed })
    .refine((v) => Number.isFinite(v) && ok(v), { message: allowed })
    .describe(description);
}

export const starSchema = z
  .strictObject({
    name: z.string().optional().describe("Name of the star (free text)"),
    luminosity: quantity("luminosity", "Bolometric luminosity", positive("W")).optional(),
    radius: quantity("length", "Photospheric radius (with temperature, gives L = 4πR²σT⁴)", positive("m")).optional(),
    temperature: quantity("temperature", "Effective temperature", positive("K")).optional(),
    mass: quantity("mass", "Stellar mass, for the period by Kepler's third law", positive("kg")).optional(),
  })
  .describe("The star: luminosity, or radius and effective temperature; mass unless orbit.period is given");

export const orbitSchema = z
  .strictObject({
    semiMajorAxis: quantity("length", "Semi-major axis", positive("m")),
    eccentricity: boundedNumber("Eccentricity, 0 ≤ e < 1", (e) => e >= 0 && e < 1, "a number with 0 ≤ e < 1"),
    period: quantity("time", "Orbital period; default from Kepler's third law", positive("s")).optional(),
    meanAnomalyAtStart: quantity("angle", "Mean anomaly at t = 0; default 0 (periastron)").optional(),
  })
  .describe("A Keplerian orbit");

export const layerSchema = z
  .strictObject({
    material: z.enum(MATERIAL_NAMES as [string, ...string[]], { error: `one of ${MATERIAL_NAMES.join(", ")}` }).describe("Layer material"),
    thickness: quantity("length", "Layer thickness", positive("m")),
  })
  .describe("A heat-storing layer; its areal heat capacity is ρ c × thickness");

const positiveNumber = (what: string) => boundedNumber(what, (v) => v > 0, "a number > 0");

export const columnSchema = z
  .strictObject({
    thermalInertia: positiveNumber("Thermal inertia √(kρc), J m⁻² K⁻¹ s⁻½ (a shortcut: k follows with ρ and c below or their defaults 1500, 800)").optional(),
    conductivity: positiveNumber("Contact conductivity k, W m⁻¹ K⁻¹").optional(),
    density: positiveNumber("Density ρ, kg m⁻³; default 1500").optional(),
    specificHeat: positiveNumber("Specific heat c, J kg⁻¹ K⁻¹; default 800").optional(),
    profile: z
      .strictObject({
        surfaceDensity: positiveNumber("Density at the surface, kg m⁻³"),
        deepDensity: positiveNumber("Density at depth, kg m⁻³"),
        surfaceConductivity: positiveNumber("Contact conductivity at the surface, W m⁻¹ K⁻¹"),
        deepConductivity: positiveNumber("Contact conductivity at depth, W m⁻¹ K⁻¹"),
        eFoldingDepth: quantity("length", "e-folding depth H of the density and conductivity", positive("m")),
      })
      .optional()
      .describe("Depth-dependent density and conductivity, x(z) = x_d − (x_d − x_s) e^(−z/H)"),
    radiativeConductivity: boundedNumber("χ in k = k_c (1 + χ (T/350 K)³); default 0", (v) => v >= 0, "a number ≥ 0").optional(),
    specificHeatPolynomial: z
      .array(z.number({ error: "numbers" }), { error: "a list of coefficients a₀, a₁, … of c(T) = Σ aᵢ Tⁱ (J kg⁻¹ K⁻¹)" })
      .min(1)
      .optional()
      .describe("c(T) = Σ aᵢ Tⁱ, J kg⁻¹ K⁻¹, T in K (overrides specificHeat)"),
    interiorFlux: quantity("flux", "Heat flux into the bottom; default body.internalFlux", nonNegative("W/m2")).optional(),
    outputDepths: z.array(quantity("length", "A depth", nonNegative("m"))).optional().describe("Depths at which to write temperature series"),
    grid: z
      .strictObject({
        topLayerFraction: boundedNumber("Top layer / shortest skin depth; default 0.05", (v) => v > 0 && v <= 1, "a number in (0, 1]").optional(),
        growth: boundedNumber("Layer growth factor; default 1.15", (v) => v >= 1 && v <= 2, "a number from 1 to 2").optional(),
        depthInSkinDepths: boundedNumber("Depth in skin depths of the longest period; default 4", (v) => v > 0 && v <= 50, "a number in (0, 50]").optional(),
        maxLayers: boundedNumber("Cap on layers; default 200", (v) => Number.isInteger(v) && v >= 3 && v <= 5000, "an integer from 3 to 5000").optional(),
        stepsPerDay: boundedNumber("Time steps per shortest forcing period; default 480", (v) => Number.isInteger(v) && v >= 16 && v <= 100000, "an integer from 16 to 100000").optional(),
      })
      .optional(),
  })
  .describe("A conduction column under the surface (instead of heatCapacity or layer)");

export const bodySchema = z
  .strictObject({
    name: z.string().optional().describe("Name of the body (free text)"),
    albedo: boundedNumber("Bond albedo, 0 ≤ A ≤ 1", (a) => a >= 0 && a <= 1, "a number with 0 ≤ A ≤ 1"),
    emissivity: boundedNumber("Thermal emissivity, 0 < ε ≤ 1; default 1", (e) => e > 0 && e <= 1, "a number with 0 < ε ≤ 1").optional(),
    heatCapacity: quantity("arealHeatCapacity", "Areal heat capacity C", positive("J/m2/K")).optional(),
    layer: layerSchema.optional(),
    column: columnSchema.optional(),
    internalFlux: quantity("flux", "Internal heat flux q; default 0", nonNegative("W/m2")).optional(),
    radius: quantity("length", "The body's radius (map: the planet's radius, for the flux an observer receives)", positive("m")).optional(),
    recirculation: boundedNumber(
      "daynight: recirculation efficiency ε ∈ [0, 1], the fraction of absorbed power carried to the night side; default 0 (no heat carried: without an exchange coefficient or internal flux the night side is at 0 K)",
      (r) => r >= 0 && r <= 1,
      "a number with 0 ≤ ε ≤ 1",
    ).optional(),
    exchangeCoefficient: quantity(
      "heatTransferCoefficient",
      "daynight: heat exchanged per kelvin of day–night difference",
      nonNegative("W/m2/K"),
    ).optional(),
    daysideWeighting: z
      .enum(DAYSIDE_WEIGHTINGS, { error: `one of ${DAYSIDE_WEIGHTINGS.join(", ")}` })
      .optional()
      .describe("daynight: uniform dayside (f = 1/2, conserves energy) or flux-weighted (f = 2/3, Cowan & Agol 2011); default uniform"),
    albedoIncidence: z
      .strictObject({
        a: boundedNumber("Cubic rise a of A(θ), dimensionless, ≥ 0 (0.06 for the Moon)", (v) => v >= 0, "a number ≥ 0"),
        b: boundedNumber("Eighth-power rise b of A(θ), dimensionless, ≥ 0 (0.25 for the Moon)", (v) => v >= 0, "a number ≥ 0"),
      })
      .optional()
      .describe(
        "point (and substellar) regimes: the albedo rises toward grazing light, A(θ) = A + a (θ/45°)³ + b (θ/90°)⁸ with θ the star's zenith angle and A = body.albedo at normal incidence (Hayne et al. 2017, JGR Planets 122, 2371); a, b dimensionless with A + 8a + b ≤ 1",
      ),
  })
  .describe("The body's surface: albedo, emissivity, heat capacity (direct, or a layer of a material)");

/** The regimes a scenario may name: the rows of the regimes table (`src/model/regimes.ts`). */
export const SCENARIO_REGIMES = REGIMES;

export const climateSchema = z
  .strictObject({
    bands: boundedNumber("zonal: latitude bands, equal steps in x = sin latitude (equal areas); default 90", (v) => Number.isInteger(v) && v >= 1 && v <= 2000, "an integer from 1 to 2000").optional(),
    diffusion: quantity("heatTransferCoefficient", "zonal: meridional diffusion D in −∂/∂x[D(1 − x²)∂T/∂x]; default 0.649 W/m2/K (North et al. 1981)", nonNegative("W/m2/K")).optional(),
    outgoing: z
      .strictObject({
        law: z.enum(OUTGOING_LAWS, { error: `one of ${OUTGOING_LAWS.join(", ")}` }).describe("blackbody εσT⁴ (default), linear a + b(T − 273.15 K), grey σT⁴/(1 + 0.75τ)"),
        a: quantity("flux", "linear: a; default 203.3 W/m2 (North et al. 1981)").optional(),
        b: quantity("heatTransferCoefficient", "linear: b; default 2.09 W/m2/K (North et al. 1981)", positive("W/m2/K")).optional(),
        opticalDepth: boundedNumber("grey: a fixed infrared optical depth τ; default τ = 0.79 (T/273 K)³ (Spiegel et al. 2008)", (v) => v >= 0, "a number ≥ 0").optional(),
      })
      .optional()
      .describe("Outgoing longwave radiation I(T)"),
    albedo: z
      .strictObject({
        law: z.enum(ALBEDO_LAWS, { error: `one of ${ALBEDO_LAWS.join(", ")}` }).describe("constant (body.albedo), step (ice below a temperature), smooth (0.525 − 0.245 tanh((T − 268 K)/5 K))"),
        p2: boundedNumber("constant/step: coefficient of P₂(x) added to the ice-free albedo; default 0", () => true, "a number").optional(),
        ice: boundedNumber("step: albedo of ice; default 0.62 (co-albedo 0.38, North et al. 1981)", (v) => v >= 0 && v <= 1, "a number from 0 to 1").optional(),
        iceTemperature: quantity("temperature", "step: ice below this temperature; default -10 degC (North 1975)", positive("K")).optional(),
        ramp: quantity("temperature", "step: width of the ramp between ice-free and ice, centred on iceTemperature; default 1 K", positive("K")).optional(),
      })
      .optional()
      .describe("Albedo: body.albedo is the ice-free value"),
    heatCapacity: z
      .strictObject({
        oceanFraction: boundedNumber("Share of each band under ocean", (v) => v >= 0 && v <= 1, "a number from 0 to 1"),
        landHeatCapacity: quantity("arealHeatCapacity", "C_l; default 5.25e6 J/m2/K (Spiegel et al. 2008)", positive("J/m2/K")).optional(),
        oceanHeatCapacity: quantity("arealHeatCapacity", "C_o; default 40 C_l (Spiegel et al. 2008)", positive("J/m2/K")).optional(),
        freezing: z.boolean({ error: "true or false" }).optional().describe("Open water freezes below 273 K with ice's heat capacity (Spiegel et al. 2008); default true"),
      })
      .optional()
      .describe("Heat capacity per band from land and ocean shares; default body.heatCapacity / body.layer everywhere"),
    start: z.enum(CLIMATE_STARTS, { error: `one of ${CLIMATE_STARTS.join(", ")}` }).optional().describe("warm (320 K), cold (220 K) or both; default both"),
    stepsPerOrbit: boundedNumber("Time steps per orbit (uniform in eccentric anomaly); default 360", (v) => Number.isInteger(v) && v >= 24 && v <= 100000, "an integer from 24 to 100000").optional(),
  })
  .describe("regime zonal: the globe as latitude bands coupled by meridional diffusion");

const RATIO = /^\s*(\d+)\s*:\s*(\d+)\s*$/;

export const spinSchema = z
  .strictObject({
    period: quantity("time", "Sidereal rotation period", positive("s")).optional(),
    orbitRatio: z
      .string({ error: 'a spin:orbit ratio such as "1:1" or "3:2"' })
      .refine((r) => RATIO.test(r) && Number(RATIO.exec(r)![1]) > 0 && Number(RATIO.exec(r)![2]) > 0, {
        message: 'a spin:orbit ratio of positive whole numbers such as "1:1" or "3:2"',
      })
      .describe('Spin–orbit resonance "p:q": p rotations every q orbits'),
    obliquity: quantity("angle", "Obliquity of the spin axis to the orbit normal, 0–180°", {
      ok: (v) => v >= 0 && v <= Math.PI,
      allowed: "an angle from 0 to 180 deg",
    }),
    axisLongitude: quantity("angle", "True anomaly at the northern spring equinox (orients the axis relative to periastron)"),
  })
  .partial()
  .describe("The spin: period or orbitRatio (default synchronous), obliquity (default 0), axisLongitude (default 0)");

export const locationSchema = z
  .strictObject({
    latitude: quantity("angle", "Latitude, −90° to 90°", {
      ok: (v) => v >= -Math.PI / 2 - 1e-12 && v <= Math.PI / 2 + 1e-12,
      allowed: "an angle from -90 to 90 deg",
    }),
    longitude: quantity("angle", "Longitude east of the meridian under the star at periastron"),
  })
  .partial()
  .describe("A place on the surface (band: latitude; point: latitude and longitude); default 0, 0");

export const mapSchema = z
  .strictObject({
    longitudes: boundedNumber("map: cells round the equator, equal steps in longitude; default 36", (k) => Number.isInteger(k) && k >= 4 && k <= 720, "a whole number from 4 to 720"),
    latitudes: boundedNumber("map: cells from pole to pole, equal steps in latitude; default 18", (k) => Number.isInteger(k) && k >= 2 && k <= 360, "a whole number from 2 to 360"),
    wind: quantity("angularRate", "map: a solid-body wind carrying the surface layer eastward relative to the ground (negative: westward); default 0"),
  })
  .partial()
  .describe("The map regime's longitude × latitude grid of cells and an optional solid-body wind");

const wavelength = (description: string) => quantity("length", description, positive("m"));

export const passbandSchema = z
  .union(
    [
      z.literal("bolometric"),
      z.strictObject({ from: wavelength("Short end of a top-hat passband"), to: wavelength("Long end of a top-hat passband") }),
      z.strictObject({
        wavelengths: z.array(wavelength("A wavelength of the response table"), { error: "a list of wavelengths" }),
        response: z.array(z.number({ error: "a number ≥ 0" }), { error: "a list of responses" }),
      }),
      z.strictObject({ file: z.string({ error: "a file path" }).describe("A CSV of (wavelength, response), relative to the scenario; the header names the wavelength unit, e.g. wavelength_um") }),
    ],
    { error: 'bolometric, {from, to}, {wavelengths, response} or {file}' },
  )
  .describe("What the detector sees: bolometric, a top-hat {from, to}, a response table, or a response file");

export const observerSchema = z
  .strictObject({
    inclination: quantity("angle", "Inclination of the orbit to the sky plane, 0–180° (90°: edge-on)", {
      ok: (v) => v >= 0 && v <= Math.PI + 1e-12,
      allowed: "an angle from 0 to 180 deg",
    }),
    argumentOfPeriastron: quantity("angle", "Argument of periastron ω of the planet's orbit; the transit is at true anomaly 90° − ω"),
    longitudeOfNode: quantity("angle", "Longitude of the ascending node (turns the sky picture; no flux depends on it)").optional(),
    passband: passbandSchema.optional(),
  })
  .describe("A distant observer (map regime): the orbit's orientation and the passband");

export function parseRatio(text: string): { spin: number; orbit: number } {
  const m = RATIO.exec(text)!;
  return { spin: Number(m[1]), orbit: Number(m[2]) };
}

export const scenarioSchema = z
  .strictObject({
    name: z.string({ error: "a text name" }).min(1, { error: "a non-empty text name" }).describe("Scenario name"),
    description: z.string().optional().describe("Free text"),
    star: starSchema,
    orbit: orbitSchema,
    body: bodySchema,
    regime: z
      .enum(SCENARIO_REGIMES, { error: `one of ${SCENARIO_REGIMES.join(", ")}` })
      .optional()
      .describe("Regime: global (f = 1/4), dayside (1/2), substellar (1), daynight (two hemispheres), band (a latitude), point (a place), zonal (the globe in latitude bands: see climate); default global"),
    spin: spinSchema.optional(),
    surface: locationSchema.optional(),
    climate: climateSchema.optional(),
    map: mapSchema.optional(),
    observer: observerSchema.optional(),
    thresholds: z
      .tuple([quantity("temperature", "Low end", positive("K")), quantity("temperature", "High end", positive("K"))], {
        error: "a [low, high] pair of temperatures",
      })
      .optional()
      .describe("Temperature window [low, high] for the time-in-range statistic"),
  })
  .describe("A calorbit scenario: star, orbit, body, regime");

export type ParsedScenario = z.output<typeof scenarioSchema>;
export type ScenarioInput = z.input<typeof scenarioSchema>;

/** The scenario format as JSON Schema (draft 2020-12), for editors. */
export function scenarioJsonSchema(): Record<string, unknown> {
  const schema = z.toJSONSchema(scenarioSchema, { io: "input", unrepresentable: "any" }) as Record<string, unknown>;
  return { ...schema, title: "calorbit scenario" };
}
