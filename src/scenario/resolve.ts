/**
 * From a scenario document (parsed YAML/JSON) to a validated ThermalCase in SI units, with a
 * FieldProblem for every bad field. Pure: the CLI reads the file, this module only judges it.
 */
import type { z } from "zod";
import { CalorbitError, clip, type FieldProblem } from "../errors.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { DEFAULT_GRID } from "../physics/column.js";
import { layerHeatCapacity, MATERIALS, type MaterialName } from "../physics/materials.js";
import { keplerPeriodSeconds } from "../physics/orbit.js";
import { luminosityFromRadiusTemperature, massParameter } from "../physics/star.js";
import { resolveClimate } from "./climate.js";
import { parseRatio, scenarioSchema, type ParsedScenario } from "./schema.js";
import { bareLuminosityWarning } from "../analysis/sanity.js";
import { physicalProblems } from "./physical.js";

/** How the heat capacity was obtained, kept for the report. */
export type HeatCapacityOrigin =
  | { kind: "direct" }
  | { kind: "column" }
  | { kind: "layer"; material: MaterialName; thicknessM: number; densityKgPerM3: number; specificHeatJPerKgK: number; source: string };

export interface ResolvedScenario {
  thermal: ThermalCase;
  heatCapacityOrigin: HeatCapacityOrigin;
  periodOrigin: "given" | "kepler";
  description?: string;
  /** Things that validate but look like a slip (a bare-number luminosity far below any star's), as sentences. */
  warnings?: string[];
}

function render(value: unknown): string {
  if (value === undefined) return "missing";
  if (typeof value === "number") return Number.isNaN(value) ? "NaN" : String(value);
  if (typeof value === "bigint") return `${value}n (a BigInt)`;
  if (typeof value === "string") return clip(JSON.stringify(value));
  let json: string | undefined;
  try {
    json = JSON.stringify(value, (_key, v: unknown) => (typeof v === "bigint" ? `${v}n` : v));
  } catch {
    return "an object that contains itself";
  }
  return json === undefined ? String(value) : clip(json, 60);
}

function valueAt(root: unknown, path: readonly PropertyKey[]): unknown {
  let v: unknown = root;
  for (const key of path) {
    if (v === null || typeof v !== "object") return undefined;
    v = (v as Record<PropertyKey, unknown>)[key];
  }
  return v;
}

function pathText(path: readonly PropertyKey[]): string {
  return path.length === 0 ? "(scenario)" : path.map((p) => (typeof p === "number" ? `[${p}]` : String(p))).join(".").replace(/\.\[/g, "[");
}

const TYPE_WORDS: Record<string, string> = {
  object: "a mapping of keys",
  number: "a number",
  string: "a text",
  array: "a list",
  boolean: "true or false",
};

/**
 * What is allowed, in our words: the schema's own message where it has one, never the validation
 * library's default wording ("Invalid input: expected object, received number").
 */
function allowedWords(issue: z.core.$ZodIssue): string {
  const isLibraryWording = /^(Invalid|Too (small|big)|Expected|Required|Unrecognized)/.test(issue.message);
  if (!isLibraryWording) return issue.message;
  if (issue.code === "invalid_type") return TYPE_WORDS[issue.expected] ?? `a value of type ${issue.expected}`;
  if (issue.code === "invalid_value") return `one of ${issue.values.map((v) => JSON.stringify(v)).join(", ")}`;
  return "a value of the form `calorbit schema` describes here";
}

/** One FieldProblem per zod issue, with the given value looked up in the raw document. */
export function problemsFromZod(error: z.ZodError, raw: unknown): FieldProblem[] {
  const problems: FieldProblem[] = [];
  for (const issue of error.issues) {
    if (issue.code === "unrecognized_keys") {
      for (const key of issue.keys) {
        problems.push({
          path: pathText([...issue.path, key]),
          given: render(valueAt(raw, [...issue.path, key])),
          allowed: "no such key here (check the spelling; `calorbit schema` lists the keys)",
        });
      }
      continue;
    }
    const given = valueAt(raw, issue.path);
    problems.push({ path: pathText(issue.path), given: render(given), allowed: allowedWords(issue) });
  }
  return problems;
}

/** Validates a parsed document and resolves it to SI; throws SCENARIO_INVALID listing every problem. */
export function resolveScenario(raw: unknown): ResolvedScenario {
  if (raw === null || typeof raw !== "object" || Array.isArray(raw)) {
    throw new CalorbitError("SCENARIO_INVALID", "the scenario must be a mapping of keys", [
      { path: "(scenario)", given: render(raw), allowed: "a mapping with keys name, star, orbit, body" },
    ]);
  }
  const result = scenarioSchema.safeParse(raw, { reportInput: true });
  if (!result.success) {
    throw new CalorbitError("SCENARIO_INVALID", "the scenario has problems", problemsFromZod(result.error, raw));
  }
  return fromParsed(result.data, raw);
}

/**
 * A document zod has already parsed, resolved to SI with every cross-field and physical check
 * (`raw` is the document as written, for the given values in messages). `resolveScenario` is
 * this after the parse; a sweep worker calls it directly with the parse assembled from parts.
 */
export function fromParsed(s: ParsedScenario, raw: unknown): ResolvedScenario {
  const problems: FieldProblem[] = [];
  const problem = (path: string, allowed: string) => problems.push({ path, given: render(valueAt(raw, path.split("."))), allowed });

  // Star: luminosity, or radius + temperature (not both ways at once).
  let luminosityW = NaN;
  if (s.star.luminosity !== undefined) {
    luminosityW = s.star.luminosity;
    if (s.star.radius !== undefined && s.star.temperature !== undefined) {
      problem("star.radius", "either star.luminosity or star.radius with star.temperature, not both");
    }
  } else if (s.star.radius !== undefined && s.star.temperature !== undefined) {
    luminosityW = luminosityFromRadiusTemperature(s.star.radius, s.star.temperature);
  } else {
    problem("star.luminosity", "a luminosity, or star.radius with star.temperature");
  }
  if (s.star.mass === undefined && s.orbit.period === undefined) {
    problem("star.mass", "a stellar mass (or give orbit.period)");
  }

  // Body: heat capacity given directly or from a layer, exactly one.
  let heatCapacity = NaN;
  let heatCapacityOrigin: HeatCapacityOrigin = { kind: "direct" };
  const column = s.body.column;
  if (column !== undefined && (s.body.heatCapacity !== undefined || s.body.layer !== undefined)) {
    problem("body.column", "either a column or body.heatCapacity / body.layer, not both");
  } else if (column !== undefined) {
    // The column stores the heat: the case has no slab heat capacity (its heat store is the column).
    heatCapacityOrigin = { kind: "column" };
    if (column.profile === undefined && column.conductivity === undefined && column.thermalInertia === undefined) {
      problem("body.column", "a thermalInertia, a conductivity, or a depth profile");
    }
    if (column.thermalInertia !== undefined && (column.conductivity !== undefined || column.profile !== undefined)) {
      problem("body.column.thermalInertia", "either thermalInertia or conductivity / profile, not both");
    }
  } else if (s.body.heatCapacity !== undefined && s.body.layer !== undefined) {
    problem("body.layer", "either body.heatCapacity or body.layer, not both");
  } else if (s.body.heatCapacity !== undefined) {
    heatCapacity = s.body.heatCapacity;
  } else if (s.body.layer !== undefined) {
    const material = s.body.layer.material as MaterialName;
    const m = MATERIALS[material];
    heatCapacity = layerHeatCapacity(m, s.body.layer.thickness);
    heatCapacityOrigin = {
      kind: "layer",
      material,
      thicknessM: s.body.layer.thickness,
      densityKgPerM3: m.densityKgPerM3,
      specificHeatJPerKgK: m.specificHeatJPerKgK,
      source: m.source,
    };
  } else if (s.regime === "zonal" && s.climate?.heatCapacity !== undefined) {
    // The bands take their heat capacity from climate.heatCapacity; this slot is only reported.
    const c = resolveClimate(s.climate, { albedo: s.body.albedo, emissivity: 1, heatCapacityJPerM2K: 1 }).heatCapacity;
    heatCapacity = c.kind === "surface" ? c.oceanFraction * c.oceanHeatCapacityJPerM2K + (1 - c.oceanFraction) * c.landHeatCapacityJPerM2K : c.heatCapacityJPerM2K;
  } else {
    problem("body.heatCapacity", "an areal heat capacity, or body.layer {material, thickness}");
  }
  if (s.body.recirculation !== undefined && s.body.exchangeCoefficient !== undefined) {
    problem("body.exchangeCoefficient", "either body.recirculation or body.exchangeCoefficient, not both");
  }
  if (s.spin?.period !== undefined && s.spin.orbitRatio !== undefined) {
    problem("spin.orbitRatio", "either spin.period or spin.orbitRatio, not both");
  }
  const zonal = s.regime === "zonal";
  if (s.climate !== undefined && !zonal) problem("climate", "climate settings only with regime: zonal");
  if (zonal && column !== undefined) problem("body.column", "no conduction column under the zonal climate's bands (body.heatCapacity, body.layer or climate.heatCapacity)");
  const passband = s.observer?.passband;
  if (passband !== undefined && typeof passband === "object" && "from" in passband && !(passband.from < passband.to)) {
    problem("observer.passband", "a top-hat {from, to} with from < to");
  }
  if (passband !== undefined && typeof passband === "object" && "wavelengths" in passband) {
    const { wavelengths: l, response: r } = passband;
    if (l.length < 2 || l.length !== r.length || l.some((x, i) => i > 0 && !(x > l[i - 1]!)) || r.some((x) => !(x >= 0))) {
      problem("observer.passband", "a table of at least two rows: wavelengths increasing, as many responses (each ≥ 0)");
    }
  }
  // A periastron at or inside the photosphere is not an orbit (checked when the radius is known).
  if (s.star.radius !== undefined && s.orbit.semiMajorAxis * (1 - s.orbit.eccentricity) <= s.star.radius) {
    const periastronM = s.orbit.semiMajorAxis * (1 - s.orbit.eccentricity);
    problem("orbit.semiMajorAxis", `an orbit whose periastron a(1 − e) clears the star's radius ${s.star.radius.toPrecision(4)} m (here a(1 − e) = ${periastronM.toPrecision(4)} m)`);
  }
  const incidence = s.body.albedoIncidence;
  if (incidence !== undefined) {
    const regime = s.regime ?? "global";
    if (regime !== "point" && regime !== "substellar") {
      problem("body.albedoIncidence", `regime point (or substellar); regime ${regime} has no single incidence angle`);
    } else if (!(s.body.albedo + 8 * incidence.a + incidence.b <= 1)) {
      problem("body.albedoIncidence", `a and b with albedo + 8a + b ≤ 1 (the albedo at 90° incidence; here ${s.body.albedo + 8 * incidence.a + incidence.b})`);
    }
  }
  if (s.thresholds && !(s.thresholds[0] < s.thresholds[1])) {
    problem("thresholds", "a [low, high] pair with low < high");
  }
  if (problems.length > 0) throw new CalorbitError("SCENARIO_INVALID", "the scenario has problems", problems);

  const starMassKg = s.star.mass ?? NaN;
  const periodSeconds =
    s.orbit.period ?? keplerPeriodSeconds(s.orbit.semiMajorAxis, massParameter({ luminosityW, massKg: starMassKg }));
  const thermal: ThermalCase = {
    name: s.name,
    star: {
      luminosityW,
      massKg: starMassKg,
      ...(s.star.radius !== undefined ? { radiusM: s.star.radius } : {}),
      ...(s.star.temperature !== undefined ? { effectiveTemperatureK: s.star.temperature } : {}),
    },
    orbit: {
      semiMajorAxisM: s.orbit.semiMajorAxis,
      eccentricity: s.orbit.eccentricity,
      periodSeconds,
      meanAnomalyAtStartRad: s.orbit.meanAnomalyAtStart ?? 0,
    },
    surface: {
      albedo: s.body.albedo,
      emissivity: s.body.emissivity ?? 1,
      ...(column === undefined ? { heatCapacityJPerM2K: heatCapacity } : {}),
      internalFluxWPerM2: s.body.internalFlux ?? 0,
      ...(incidence !== undefined ? { albedoIncidence: { a: incidence.a, b: incidence.b } } : {}),
    },
    regime: s.regime ?? "global",
    ...(s.thresholds ? { windowK: [s.thresholds[0], s.thresholds[1]] as const } : {}),
    exchange: {
      recirculation: s.body.recirculation ?? 0,
      coefficientWPerM2K: s.body.exchangeCoefficient ?? 0,
      weighting: s.body.daysideWeighting ?? "uniform",
    },
    location: { latitudeRad: s.surface?.latitude ?? 0, longitudeRad: s.surface?.longitude ?? 0 },
  };
  if (column !== undefined) thermal.column = columnSpec(column, s.body.internalFlux ?? 0);
  if (zonal) thermal.climate = resolveClimate(s.climate, { albedo: s.body.albedo, emissivity: s.body.emissivity ?? 1, heatCapacityJPerM2K: heatCapacity });
  if (s.map !== undefined || thermal.regime === ("map" as string)) {
    thermal.map = { longitudes: s.map?.longitudes ?? 36, latitudes: s.map?.latitudes ?? 18, windRadPerSecond: s.map?.wind ?? 0 };
  }
  if (s.body.radius !== undefined) thermal.bodyRadiusM = s.body.radius;
  if (s.observer !== undefined) thermal.observer = observerSpec(s.observer);
  const n = (2 * Math.PI) / periodSeconds;
  const ratio = s.spin?.orbitRatio !== undefined ? parseRatio(s.spin.orbitRatio) : s.spin?.period === undefined ? { spin: 1, orbit: 1 } : undefined;
  thermal.spin = {
    rateRadPerSecond: s.spin?.period !== undefined ? (2 * Math.PI) / s.spin.period : (n * ratio!.spin) / ratio!.orbit,
    ...(ratio ? { ratio } : {}),
    obliquityRad: s.spin?.obliquity ?? 0,
    equinoxTrueAnomalyRad: s.spin?.axisLongitude ?? 0,
  };
  // Physics no run can give (nothing absorbed, a place never lit, c(T) ≤ 0, C below any surface's), by field.
  const heatCapacityPath = column !== undefined ? undefined : s.body.heatCapacity !== undefined ? "body.heatCapacity" : s.body.layer !== undefined ? "body.layer.thickness" : undefined;
  const physical = physicalProblems(thermal, (path) => render(valueAt(raw, path.split("."))), heatCapacityPath);
  if (physical.length > 0) throw new CalorbitError("SCENARIO_INVALID", "the scenario asks for what no run can give", physical);
  const rawLuminosity = valueAt(raw, ["star", "luminosity"]);
  const bareLuminosity = typeof rawLuminosity === "number" || (typeof rawLuminosity === "string" && /^\s*[+-]?[\d.]+([eE][+-]?\d+)?\s*$/.test(rawLuminosity));
  const luminosityWarning = bareLuminosity ? bareLuminosityWarning("star.luminosity", luminosityW) : undefined;
  return {
    thermal,
    heatCapacityOrigin,
    ...(luminosityWarning !== undefined ? { warnings: [luminosityWarning] } : {}),
    periodOrigin: s.orbit.period !== undefined ? "given" : "kepler",
    ...(s.description !== undefined ? { description: s.description } : {}),
  };
}

type ObserverInput = NonNullable<ParsedScenario["observer"]>;

/** The observer in SI; a passband file stays a path for the CLI to read. */
function observerSpec(o: ObserverInput): NonNullable<ThermalCase["observer"]> {
  const p = o.passband ?? "bolometric";
  const passband: NonNullable<ThermalCase["observer"]>["passband"] =
    p === "bolometric"
      ? { kind: "bolometric" }
      : "file" in p
        ? { kind: "file", path: p.file }
        : "from" in p
          ? { kind: "tophat", fromM: p.from, toM: p.to }
          : { kind: "table", wavelengthM: p.wavelengths, response: p.response };
  return {
    inclinationRad: o.inclination,
    argumentOfPeriastronRad: o.argumentOfPeriastron,
    longitudeOfNodeRad: o.longitudeOfNode ?? 0,
    passband,
  };
}

type ColumnInput = NonNullable<ParsedScenario["body"]["column"]>;

/** The column's properties in SI: a homogeneous layer, a thermal inertia, or a depth profile. */
function columnSpec(c: ColumnInput, internalFlux: number): NonNullable<ThermalCase["column"]> {
  const density = c.density ?? 1500;
  const specificHeat = c.specificHeat ?? 800;
  const conductivity = c.conductivity ?? (c.thermalInertia !== undefined ? c.thermalInertia ** 2 / (density * specificHeat) : NaN);
  const profile = c.profile;
  return {
    properties: {
      densitySurface: profile?.surfaceDensity ?? density,
      densityDeep: profile?.deepDensity ?? density,
      conductivitySurface: profile?.surfaceConductivity ?? conductivity,
      conductivityDeep: profile?.deepConductivity ?? conductivity,
      eFoldingDepthM: profile?.eFoldingDepth ?? Infinity,
      specificHeatPolynomial: c.specificHeatPolynomial ?? [specificHeat],
      radiativeChi: c.radiativeConductivity ?? 0,
    },
    grid: {
      ...DEFAULT_GRID,
      ...(c.grid?.topLayerFraction !== undefined ? { topLayerFraction: c.grid.topLayerFraction } : {}),
      ...(c.grid?.growth !== undefined ? { growth: c.grid.growth } : {}),
      ...(c.grid?.depthInSkinDepths !== undefined ? { depthInSkinDepths: c.grid.depthInSkinDepths } : {}),
      ...(c.grid?.maxLayers !== undefined ? { maxLayers: c.grid.maxLayers } : {}),
      ...(c.grid?.stepsPerDay !== undefined ? { stepsPerShortestPeriod: c.grid.stepsPerDay } : {}),
    },
    outputDepthsM: c.outputDepths ?? [],
    interiorFluxWPerM2: c.interiorFlux ?? internalFlux,
  };
}
