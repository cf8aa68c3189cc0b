/**
 * Physical and astronomical constants, SI units, one value each for the whole tree.
 * Each carries its source beside it; nothing else in calorbit may restate these numbers.
 */

/** Stefan–Boltzmann constant σ, W m⁻² K⁻⁴ (exact). CODATA 2018. */
export const STEFAN_BOLTZMANN = 5.670374419e-8;

/** Wien wavelength displacement constant b, m K (exact). CODATA 2018. */
export const WIEN_DISPLACEMENT_M_K = 2.897771955e-3;

/** Newtonian constant of gravitation G, m³ kg⁻¹ s⁻². CODATA 2018. */
export const GRAVITATIONAL_CONSTANT = 6.6743e-11;

/** Nominal solar radius R☉, m. IAU 2015 Resolution B3. */
export const SOLAR_RADIUS_M = 6.957e8;

/** Nominal solar luminosity L☉, W. IAU 2015 Resolution B3. */
export const SOLAR_LUMINOSITY_W = 3.828e26;

/** Nominal solar effective temperature T☉, K. IAU 2015 Resolution B3. */
export const SOLAR_EFFECTIVE_TEMPERATURE_K = 5772;

/** Nominal solar mass parameter (GM)☉, m³ s⁻². IAU 2015 Resolution B3. */
export const SOLAR_MASS_PARAMETER = 1.3271244e20;

/** Solar mass implied by the nominal (GM)☉ and CODATA 2018 G, kg (derived). */
export const SOLAR_MASS_KG = SOLAR_MASS_PARAMETER / GRAVITATIONAL_CONSTANT;

/** Nominal terrestrial radius (equatorial), m. IAU 2015 Resolution B3. */
export const EARTH_EQUATORIAL_RADIUS_M = 6.3781e6;

/** Nominal Jovian radius (equatorial), m. IAU 2015 Resolution B3. */
export const JUPITER_EQUATORIAL_RADIUS_M = 7.1492e7;

/** Astronomical unit, m (exact). IAU 2012 Resolution B2. */
export const ASTRONOMICAL_UNIT_M = 149_597_870_700;

/** Day, s (exact). IAU. */
export const DAY_S = 86_400;

/** Julian year, s (365.25 d). IAU. */
export const JULIAN_YEAR_S = 365.25 * DAY_S;

/** 0 °C in kelvin (exact). SI definition of the Celsius scale. */
export const ZERO_CELSIUS_K = 273.15;
