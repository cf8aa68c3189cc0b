/**
 * Insolation geometry of a spinning body: declination of the star through the year, hour angle at
 * a surface point, the cosine of the stellar zenith angle, the daily-mean insolation at a latitude,
 * the solar day and the substellar longitude.
 *
 * Conventions (calorbit's own): the spin axis is fixed in space with obliquity θ to the orbit
 * normal; `equinoxTrueAnomaly` is the true anomaly at which the body passes its northern spring
 * equinox (the star crosses the equator northward), so the star's longitude from the equinox is
 * l = ν − ν_eq. Longitude 0 on the body is the meridian under the star at periastron.
 */
const TWO_PI = 2 * Math.PI;

export interface SpinGeometry {
  /** Sidereal rotation rate Ω, rad s⁻¹ (> 0, prograde). */
  rateRadPerSecond: number;
  /** Obliquity θ, rad, 0 ≤ θ ≤ π. */
  obliquityRad: number;
  /** True anomaly at the northern spring equinox, rad. */
  equinoxTrueAnomalyRad: number;
}

/*
 * Each formula below is written once, in a form that takes sines and cosines already at hand (what a
 * forcing evaluated millions of times per run needs), with an angle-taking form beside it.
 */

/** sin δ = sin θ sin l: the sine of the star's declination at longitude l = ν − ν_eq from the equinox (spherical astronomy, common practice). */
export function sinDeclinationAt(sinObliquity: number, sinStarLongitude: number): number {
  return sinObliquity * sinStarLongitude;
}

/** Declination δ of the star, rad: sin δ = sin θ sin(ν − ν_eq). */
export function stellarDeclination(obliquityRad: number, trueAnomalyRad: number, equinoxTrueAnomalyRad: number): number {
  return Math.asin(sinDeclinationAt(Math.sin(obliquityRad), Math.sin(trueAnomalyRad - equinoxTrueAnomalyRad)));
}

/** Right ascension α of the star, rad, from cos θ and the sine and cosine of its longitude l: tan α = cos θ tan l. */
export function rightAscensionAt(cosObliquity: number, sinStarLongitude: number, cosStarLongitude: number): number {
  return Math.atan2(cosObliquity * sinStarLongitude, cosStarLongitude);
}

/** Right ascension α of the star in the body's equatorial frame, rad: tan α = cos θ tan l. */
export function stellarRightAscension(obliquityRad: number, trueAnomalyRad: number, equinoxTrueAnomalyRad: number): number {
  const l = trueAnomalyRad - equinoxTrueAnomalyRad;
  return rightAscensionAt(Math.cos(obliquityRad), Math.sin(l), Math.cos(l));
}

/**
 * Daily-mean insolation at latitude φ for declination δ and the flux S at the current distance,
 * W m⁻²: Q = (S/π)(h₀ sin φ sin δ + cos φ cos δ sin h₀), cos h₀ = −tan φ tan δ, with h₀ = π in polar
 * day and 0 in polar night (Berger 1978, J. Atmos. Sci. 35, 2362; the rotation is taken as fast
 * compared with the orbit).
 */
export function dailyMeanInsolation(fluxWPerM2: number, latitudeRad: number, declinationRad: number): number {
  return dailyMeanInsolationOf(fluxWPerM2, Math.sin(latitudeRad), Math.cos(latitudeRad), Math.sin(declinationRad), Math.cos(declinationRad));
}

/** The same daily mean from the sines and cosines of φ and δ (for loops over many latitudes). */
export function dailyMeanInsolationOf(fluxWPerM2: number, sinLatitude: number, cosLatitude: number, sinDeclination: number, cosDeclination: number): number {
  const sinProduct = sinLatitude * sinDeclination;
  const cosProduct = cosLatitude * cosDeclination;
  const c = cosProduct === 0 ? (sinProduct > 0 ? -Infinity : Infinity) : -sinProduct / cosProduct;
  let h0: number;
  if (c <= -1) h0 = Math.PI; // polar day
  else if (c >= 1) h0 = 0; // polar night
  else h0 = Math.acos(c);
  return Math.max(0, (fluxWPerM2 / Math.PI) * (h0 * sinProduct + cosProduct * Math.sin(h0)));
}

/** cos z = sin φ sin δ + cos φ cos δ cos H from the sines and cosines of φ and δ (common practice); negative below the horizon. */
export function cosZenithFrom(sinLatitude: number, cosLatitude: number, sinDeclination: number, cosDeclination: number, hourAngleRad: number): number {
  return sinLatitude * sinDeclination + cosLatitude * cosDeclination * Math.cos(hourAngleRad);
}

/**
 * cos z with no angle taken: the star at longitude l from the equinox sits at (cos l, cos θ sin l,
 * sin θ sin l) in the body's equatorial frame, i.e. cos δ cos α = cos l, cos δ sin α = cos θ sin l,
 * sin δ = sin θ sin l. With the point's angle A = H + α = λ + α★(0) + φ (`hourAngleFrom` before the
 * star's right ascension is taken off), cos δ cos H = cos A cos l + sin A cos θ sin l, so
 * cos z = sin φ sin θ sin l + cos φ (cos A cos l + sin A cos θ sin l): the same cos z as
 * `cosZenithFrom`, from the sines and cosines of l and A alone (for a forcing evaluated millions of
 * times per run: no arctangent, no square root).
 */
export function cosZenithFromAngles(
  sinLatitude: number,
  cosLatitude: number,
  sinObliquity: number,
  cosObliquity: number,
  sinStarLongitude: number,
  cosStarLongitude: number,
  sinPointAngle: number,
  cosPointAngle: number,
): number {
  const y = cosObliquity * sinStarLongitude;
  return sinLatitude * sinObliquity * sinStarLongitude + cosLatitude * (cosPointAngle * cosStarLongitude + sinPointAngle * y);
}

/** cos z = sin φ sin δ + cos φ cos δ cos H (common practice); negative below the horizon. */
export function cosZenith(latitudeRad: number, declinationRad: number, hourAngleRad: number): number {
  return cosZenithFrom(Math.sin(latitudeRad), Math.cos(latitudeRad), Math.sin(declinationRad), Math.cos(declinationRad), hourAngleRad);
}

/**
 * Mean solar day, s: the synodic period 2π/|Ω − sgn(cos θ) n| of a spin of rate Ω (> 0) about an
 * axis of obliquity θ against the mean motion n. With θ > 90° the body turns against its orbital
 * motion (a retrograde spin written as a prograde one about the flipped axis), so the star's daily
 * motion adds to the spin instead of cancelling it: a 1:1 spin at θ = 180° has two solar days per
 * orbit (common practice). Null only for a synchronous spin (Ω = n, θ < 90°), which has no solar
 * day; at exactly θ = 90° the orbit's motion is along the axis and the day is the sidereal one.
 */
export function solarDaySeconds(spinRateRadPerSecond: number, meanMotionRadPerSecond: number, obliquityRad: number): number | null {
  const cosTheta = Math.cos(obliquityRad);
  const sense = Math.abs(cosTheta) < 1e-12 ? 0 : Math.sign(cosTheta);
  const difference = Math.abs(spinRateRadPerSecond - sense * meanMotionRadPerSecond);
  return difference <= 1e-12 * meanMotionRadPerSecond ? null : TWO_PI / difference;
}

/**
 * Hour angle of the point at longitude λ (rad), given the body's rotation since periastron
 * Ω (t − t_p) and the star's direction: H = λ + α★(0) + Ω (t − t_p) − α★(ν). With θ = 0 this is
 * λ + Ω (t − t_p) − ν: on a locked orbit (Ω = n) the star librates by ν − M ≈ 2e sin M.
 */
export function hourAngle(
  spin: SpinGeometry,
  longitudeRad: number,
  secondsSincePeriastron: number,
  trueAnomalyRad: number,
): number {
  const alphaAtPeriastron = stellarRightAscension(spin.obliquityRad, 0, spin.equinoxTrueAnomalyRad);
  const alpha = stellarRightAscension(spin.obliquityRad, trueAnomalyRad, spin.equinoxTrueAnomalyRad);
  return hourAngleFrom(longitudeRad, alphaAtPeriastron, spin.rateRadPerSecond * secondsSincePeriastron, alpha);
}

/** H = λ + α★(0) + φ − α★: the hour angle from the spin angle φ = Ω (t − t_p) turned since periastron and the star's right ascensions then and now, rad. */
export function hourAngleFrom(longitudeRad: number, rightAscensionAtPeriastronRad: number, spinAngleRad: number, rightAscensionRad: number): number {
  return longitudeRad + rightAscensionAtPeriastronRad + spinAngleRad - rightAscensionRad;
}

/** Sub-stellar longitude (rad, wrapped to (−π, π]) at zero obliquity: the point where H = 0. */
export function substellarLongitude(spinRate: number, secondsSincePeriastron: number, trueAnomalyRad: number): number {
  const x = trueAnomalyRad - spinRate * secondsSincePeriastron;
  return x - TWO_PI * Math.round(x / TWO_PI);
}
