/**
 * Physics a scenario asks for that no run can give, named by the user's own field: a c(T) that is
 * not positive at the temperatures the orbit gives, a heat capacity below any real surface's (both
 * at validation); a surface that absorbs nothing (albedo 1, no internal heat) or a place the star
 * never reaches (both before a case runs). Each is one FieldProblem (field, given value, what is
 * allowed), so the CLI prints one line and exits 2 instead of letting a solver fail later with a
 * message about its own internals. Pure: no I/O.
 */
import { MIN_AREAL_HEAT_CAPACITY_J_PER_M2K, STEFAN_BOLTZMANN } from "../constants.js";
import { CalorbitError, type FieldProblem } from "../errors.js";
import { REGIME_TABLE } from "../model/regimes.js";
import type { Surface } from "../model/surface.js";
import type { ThermalCase } from "../model/thermalCase.js";
import { stellarFlux } from "../physics/flux.js";

/** A cycle-mean absorbed flux below this share of (1 − A) S(a) is no sunlight at all (rounding of cos z = 0 on a horizon). */
const DARK_SHARE = 1e-12;
/** c(T) is checked from this share of the hottest equilibrium temperature up to it. */
const COLDEST_SHARE = 0.1;
/** Points at which c(T) is evaluated over that range. */
const CHECK_POINTS = 512;

/** How a given value is echoed (the caller's renderer of the raw document's value at a path). */
export type GivenAt = (path: string) => string;

/** The hottest temperature the orbit gives: radiative equilibrium facing the star at periastron (plus internal heat), K. */
export function hottestEquilibriumK(thermal: ThermalCase): number {
  const { orbit, surface } = thermal;
  const absorbed = (1 - surface.albedo) * stellarFlux(thermal.star.luminosityW, orbit.semiMajorAxisM * (1 - orbit.eccentricity));
  return ((absorbed + surface.internalFluxWPerM2) / (surface.emissivity * STEFAN_BOLTZMANN)) ** 0.25;
}

/**
 * The problems of a resolved case's physics, one per field. `heatCapacityPath` names the field the
 * slab's heat capacity came from (body.heatCapacity, or body.layer.thickness for a layer), or is
 * undefined when the case has no slab (a column, or the zonal climate's own capacities).
 */
export function physicalProblems(thermal: ThermalCase, given: GivenAt, heatCapacityPath: string | undefined): FieldProblem[] {
  const problems: FieldProblem[] = [];
  const { surface } = thermal;
  const capacity = surface.heatCapacityJPerM2K;
  if (heatCapacityPath !== undefined && capacity !== undefined && capacity < MIN_AREAL_HEAT_CAPACITY_J_PER_M2K) {
    problems.push({
      path: heatCapacityPath,
      given: given(heatCapacityPath),
      allowed: `an areal heat capacity of at least ${MIN_AREAL_HEAT_CAPACITY_J_PER_M2K.toExponential()} J/m2/K${heatCapacityPath === "body.heatCapacity" ? "" : ` (here ρ c × thickness = ${capacity.toExponential(2)} J/m2/K)`}, as no real surface stores less (one sheet of graphene holds about 5e-4); the equilibrium row of any run is the surface that stores no heat`,
    });
  }
  const polynomial = thermal.column?.properties.specificHeatPolynomial;
  if (polynomial !== undefined && polynomial.length > 1) {
    const problem = specificHeatProblem(polynomial, hottestEquilibriumK(thermal), given);
    if (problem) problems.push(problem);
  } else if (polynomial !== undefined && !(polynomial[0]! > 0)) {
    problems.push({ path: "body.column.specificHeatPolynomial", given: given("body.column.specificHeatPolynomial"), allowed: "a specific heat c(T) above 0 J kg⁻¹ K⁻¹" });
  }
  return problems;
}

/**
 * A case whose surface never absorbs anything: albedo 1 without internal heat, or a band or point
 * the star never reaches. Checked when a case is about to run rather than when a scenario is read,
 * so that a sweep or a fit may take albedo 1 or a pole as the end of its range (that case alone
 * fails, as its row or evaluation) while a single run is refused in one line before any solve.
 */
export function darknessProblems(thermal: ThermalCase, surface?: Surface): FieldProblem[] {
  const optics = thermal.surface;
  if (optics.internalFluxWPerM2 > 0 || thermal.climate !== undefined) return [];
  if (optics.albedo >= 1) {
    return [
      {
        path: "body.albedo",
        given: String(optics.albedo),
        allowed: "an albedo below 1 (at 1 the surface reflects all starlight, absorbs nothing and cools toward 0 K, so it has no steady temperature), or body.internalFlux above 0",
      },
    ];
  }
  if (thermal.regime !== "band" && thermal.regime !== "point") return [];
  const problem = darkPlaceProblem(thermal, surface ?? REGIME_TABLE[thermal.regime].surface(thermal));
  return problem ? [problem] : [];
}

/** c(T) = Σ aᵢ Tⁱ must be positive wherever the surface can be: from a tenth of the hottest equilibrium up to it. */
function specificHeatProblem(polynomial: readonly number[], hottestK: number, given: GivenAt): FieldProblem | undefined {
  const lowK = COLDEST_SHARE * hottestK;
  const c = (T: number): number => {
    let sum = 0;
    for (let i = polynomial.length - 1; i >= 0; i--) sum = sum * T + polynomial[i]!;
    return sum;
  };
  for (let k = 0; k <= CHECK_POINTS; k++) {
    const T = lowK + ((hottestK - lowK) * k) / CHECK_POINTS;
    const value = c(T);
    if (value > 0) continue;
    return {
      path: "body.column.specificHeatPolynomial",
      given: given("body.column.specificHeatPolynomial"),
      allowed: `coefficients whose c(T) stays above 0 J kg⁻¹ K⁻¹ from ${lowK.toFixed(0)} K to ${hottestK.toFixed(0)} K, the temperatures this orbit can give (here c(${T.toFixed(0)} K) = ${Number.isFinite(value) ? value.toPrecision(3) : String(value)} J kg⁻¹ K⁻¹)`,
    };
  }
  return undefined;
}

/** A band or point that the star never reaches over the whole cycle, named by the field to change. */
function darkPlaceProblem(thermal: ThermalCase, surface: Surface): FieldProblem | undefined {
  const cell = surface.cells[0]!;
  const reference = (1 - thermal.surface.albedo) * stellarFlux(thermal.star.luminosityW, thermal.orbit.semiMajorAxisM);
  if (cell.forcing.meanAbsorbedWPerM2 > DARK_SHARE * reference) return undefined;
  const latitude = thermal.location?.latitudeRad ?? 0;
  const obliquity = thermal.spin?.obliquityRad ?? 0;
  const atPole = Math.abs(Math.abs(latitude) - Math.PI / 2) < 1e-9;
  if (atPole || thermal.regime === "band") {
    const upright = Math.min(obliquity, Math.PI - obliquity) < 1e-9;
    return {
      path: "surface.latitude",
      given: degrees(latitude),
      allowed: `a latitude the star rises over${upright ? " (with spin.obliquity 0 a pole has the star on its horizon all year: move off the pole, or tilt the axis)" : ""}, or body.internalFlux above 0`,
    };
  }
  return {
    path: "surface.longitude",
    given: degrees(thermal.location?.longitudeRad ?? 0),
    allowed: "a longitude the star rises over during the cycle (this spin keeps the place in night, as on a locked body's far side: move it toward longitude 0, or give spin.period or spin.orbitRatio a rate that turns it to the star), or body.internalFlux above 0",
  };
}

/** An angle as the scenario's bare degrees (rounded to 1e-9 of a degree). */
function degrees(rad: number): string {
  return `${Number(((rad * 180) / Math.PI).toFixed(9))} deg`;
}

/** Throws SCENARIO_INVALID with `darknessProblems`' one problem (`surface`: the model's, when built already), if any: "absorbs no starlight" (albedo 1) or "never sees the star". */
export function refuseDarkness(thermal: ThermalCase, surface?: Surface): void {
  const problems = darknessProblems(thermal, surface);
  if (problems.length === 0) return;
  const message = problems[0]!.path === "body.albedo" ? "the surface absorbs no starlight" : "the surface never sees the star";
  throw new CalorbitError("SCENARIO_INVALID", message, problems);
}
