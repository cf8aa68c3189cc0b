import { describe, expect, it } from "vitest";
import { allowedUnits, parseQuantity, type QuantityKind } from "../src/scenario/units.js";

const si = (kind: QuantityKind, raw: unknown): number => {
  const parsed = parseQuantity(kind, raw);
  if (!parsed.ok) throw new Error(`${String(raw)} was refused: ${parsed.allowed}`);
  return parsed.valueSI;
};
const refusal = (kind: QuantityKind, raw: unknown): string => {
  const parsed = parseQuantity(kind, raw);
  if (parsed.ok) throw new Error(`${String(raw)} was accepted as ${parsed.valueSI}`);
  return parsed.allowed;
};

describe("the unit parser (scenario values to SI)", () => {
  it("converts the astronomical units by their defining values", () => {
    expect(si("length", "1 au")).toBe(149_597_870_700); // IAU 2012 Resolution B2 (exact)
    expect(si("length", "2.5 Rsun")).toBeCloseTo(2.5 * 6.957e8, 3); // IAU 2015 B3 nominal solar radius
    expect(si("luminosity", "1 Lsun")).toBe(3.828e26); // IAU 2015 B3 nominal luminosity
    // The nominal solar mass parameter over CODATA 2018 G: 1.3271244e20 / 6.67430e-11 kg (IAU 2015 B3).
    expect(Math.abs(si("mass", "1 Msun") / (1.3271244e20 / 6.6743e-11) - 1)).toBeLessThan(1e-15);
  });

  it("converts times by the IAU day and Julian year, and lengths by the SI prefixes", () => {
    expect(si("time", "2 d")).toBe(172_800);
    expect(si("time", "1 yr")).toBe(365.25 * 86_400);
    expect(si("time", "90 min")).toBe(5400);
    expect(si("time", "1.5 h")).toBe(5400);
    expect(si("length", "12 cm")).toBeCloseTo(0.12, 15);
    expect(si("length", "3 km")).toBe(3000);
  });

  it("offsets Celsius by 273.15 K (SI definition) and scales degrees by π/180", () => {
    expect(si("temperature", "0 degC")).toBe(273.15);
    expect(si("temperature", "-40 °C")).toBeCloseTo(233.15, 12);
    expect(si("temperature", "300 K")).toBe(300);
    expect(si("angle", "90 deg")).toBeCloseTo(Math.PI / 2, 15);
    expect(si("angle", "180°")).toBeCloseTo(Math.PI, 15);
  });

  it("reads the usual spellings of compound units as one unit", () => {
    for (const spelling of ["J/m2/K", "J m-2 K-1", "J/(m2 K)", "J/m^2/K", "J/m²/K"]) {
      expect(si("arealHeatCapacity", `4.2 ${spelling}`), spelling).toBe(4.2);
    }
    expect(si("arealHeatCapacity", "2 MJ m-2 K-1")).toBe(2e6);
    expect(si("flux", "65 mW/m2")).toBeCloseTo(0.065, 15);
    expect(si("flux", "1361 W m-2")).toBe(1361);
  });

  it("passes SI numbers through and reads a bare number string as SI", () => {
    expect(si("length", 42)).toBe(42);
    expect(si("time", "1e3")).toBe(1000);
    expect(si("length", " 7.5e-3 m ")).toBe(7.5e-3);
  });

  it("refuses what it cannot read, saying what is allowed", () => {
    // The unit lists grow as units are added; the messages name whatever the table holds.
    const lengths = allowedUnits("length");
    expect(lengths).toMatch(/\bau\b/);
    expect(refusal("length", "3 furlongs")).toBe(`unit one of ${lengths} (unknown unit "furlongs")`);
    expect(refusal("time", "soon")).toBe(`a number in s or a string "<number> <unit>" with unit one of ${allowedUnits("time")}`);
    expect(refusal("length", Number.POSITIVE_INFINITY)).toBe(`a finite number (a number in m or a string "<number> <unit>" with unit one of ${lengths})`);
    expect(refusal("length", Number.NaN)).toMatch(/^a finite number/);
    expect(refusal("mass", true)).toBe(`a number in kg or a string "<number> <unit>" with unit one of ${allowedUnits("mass")}`);
    expect(refusal("length", "1e400 m")).toMatch(/^a number in m/);
    // A unit of another kind is not silently accepted.
    expect(refusal("time", "3 au")).toBe(`unit one of ${allowedUnits("time")} (unknown unit "au")`);
  });
});
