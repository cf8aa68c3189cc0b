import { describe, expect, it } from "vitest";
import * as C from "../src/constants.js";

describe("constants", () => {
  it("Stefan–Boltzmann and Wien constants are the exact CODATA 2018 values", () => {
    expect(C.STEFAN_BOLTZMANN).toBe(5.670374419e-8); // CODATA 2018
    expect(C.WIEN_DISPLACEMENT_M_K).toBe(2.897771955e-3); // CODATA 2018
  });
  it("G is the CODATA 2018 value", () => {
    expect(C.GRAVITATIONAL_CONSTANT).toBe(6.6743e-11); // CODATA 2018
  });
  it("nominal solar values are those of IAU 2015 Resolution B3", () => {
    expect(C.SOLAR_RADIUS_M).toBe(6.957e8);
    expect(C.SOLAR_LUMINOSITY_W).toBe(3.828e26);
    expect(C.SOLAR_EFFECTIVE_TEMPERATURE_K).toBe(5772);
    expect(C.SOLAR_MASS_PARAMETER).toBe(1.3271244e20);
  });
  it("the astronomical unit is exact per IAU 2012 Resolution B2, and the day and Julian year per IAU", () => {
    expect(C.ASTRONOMICAL_UNIT_M).toBe(149_597_870_700);
    expect(C.DAY_S).toBe(86_400);
    expect(C.JULIAN_YEAR_S).toBe(365.25 * 86_400);
  });
});
