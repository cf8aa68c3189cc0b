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

/** Planck constant h, J s (exact). CODATA 2018. */
export const PLANCK_CONSTANT = 6.62607015e-34;

/** Speed of light in vacuum c, m s⁻¹ (exact). SI definition of the metre. */
export const SPEED_OF_LIGHT_M_PER_S = 299_792_458;

/** Boltzmann constant k, J K⁻¹ (exact). CODATA 2018. */
export const BOLTZMANN_CONSTANT = 1.380649e-23;

// Latitudinal energy-balance (zonal climate) parameters: published defaults, not laws of nature.

/** North's linear outgoing radiation I = A + B (T − 0 °C): A, W m⁻². North, Cahalan & Coakley 1981, Rev. Geophys. 19, 91. */
export const NORTH_OUTGOING_A_W_PER_M2 = 203.3;
/** North's linear outgoing radiation: B, W m⁻² K⁻¹. North, Cahalan & Coakley 1981. */
export const NORTH_OUTGOING_B_W_PER_M2K = 2.09;
/** Ice-edge temperature of North's step albedo, K (−10 °C). North 1975, J. Atmos. Sci. 32, 1301. */
export const NORTH_ICE_EDGE_K = 263.15;
/** Grey infrared optical depth at 273 K, τ_IR = 0.79 (T/273 K)³. Spiegel, Menou & Scharf 2008, ApJ 681, 1609 (from memory). */
export const GREY_OPTICAL_DEPTH_AT_273K = 0.79;
/** Reference temperature of the grey optical depth, K. Spiegel et al. 2008 (from memory). */
export const GREY_OPTICAL_DEPTH_REFERENCE_K = 273;
/** Smooth ice albedo A(T) = 0.525 − 0.245 tanh((T − 268 K)/5 K): midpoint, half-range, centre, width. Spiegel et al. 2008 (from memory). */
export const SMOOTH_ICE_ALBEDO = { midpoint: 0.525, halfRange: 0.245, centreK: 268, widthK: 5 } as const;
/** Land heat capacity C_l, J m⁻² K⁻¹ (5.25e9 erg cm⁻² K⁻¹). Spiegel et al. 2008 (from memory). */
export const SPIEGEL_LAND_HEAT_CAPACITY_J_PER_M2K = 5.25e6;
/** Ocean heat capacity over land, C_o = 40 C_l (a 50 m mixed layer). Spiegel et al. 2008 (from memory). */
export const SPIEGEL_OCEAN_OVER_LAND = 40;
/** Ice heat capacity over land: 9.2 C_l between 263 and 273 K (latent heat spread over 10 K), 2 C_l below 263 K. Spiegel et al. 2008 (from memory). */
export const SPIEGEL_ICE_OVER_LAND = { nearFreezing: 9.2, cold: 2 } as const;
/** Ice fraction of open water below freezing, f_i = 1 − exp((T − 273 K)/10 K). Spiegel et al. 2008 (from memory). */
export const SPIEGEL_ICE_FRACTION_SCALE_K = 10;
/** Freezing point used by the Spiegel et al. 2008 ice fraction and ice heat capacity, K (from memory). */
export const SPIEGEL_FREEZING_K = 273;
/** Lower edge of the near-freezing ice heat capacity, K. Spiegel et al. 2008 (from memory). */
export const SPIEGEL_COLD_ICE_K = 263;
/** North's meridional diffusion coefficient D (x = sin latitude form), W m⁻² K⁻¹. North, Cahalan & Coakley 1981. */
export const NORTH_DIFFUSION_W_PER_M2K = 0.649;
/** Albedo of ice in North's model: co-albedo 0.38. North, Cahalan & Coakley 1981. */
export const NORTH_ICE_ALBEDO = 1 - 0.38;

/**
 * The smallest areal heat capacity a scenario may give, J m⁻² K⁻¹: below any real surface's (one
 * sheet of graphene, 0.77 mg m⁻² at about 700 J kg⁻¹ K⁻¹, holds about 5e-4 J m⁻² K⁻¹; from memory).
 * A validation floor, not a property of matter.
 */
export const MIN_AREAL_HEAT_CAPACITY_J_PER_M2K = 1e-4;
