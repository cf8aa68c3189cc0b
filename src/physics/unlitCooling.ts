/**
 * A slab in the dark: C dT/dt = q − εσT⁴ (no starlight, internal flux q ≥ 0) is separable, so its
 * flow has a closed form and a night needs no time steps.
 *
 * With a⁴ = q/(εσ) (the temperature the internal flux alone holds) and k = εσ/C, partial fractions
 * give ∫dT/(T⁴ − a⁴) = (1/(4a³)) ln((T − a)/(T + a)) − (1/(2a³)) arctan(T/a) (a standard integral;
 * derived here). For T > a write it through G(T) = (artanh(a/T) − arctan(a/T))/a³, which falls
 * as T rises: the flow keeps G(T(t)) = G(T₀) + 2kt. The series
 *   G(T) = (2/T³) Σⱼ (a/T)^(4j)/(4j + 3)
 * (the difference of the artanh and arctan series) needs no a in a denominator, is exact at q = 0
 * (G = 2/(3T³): the T⁻³ cooling law) and converges fast where a/T ≤ 1/2; above that the closed form
 * is used. T(t) is found from G by Newton's method kept inside a bracket.
 *
 * The flow's slope ∂T(t)/∂T₀ = (q − εσT⁴)/(q − εσT₀⁴) (any autonomous scalar flow: f(T)/f(T₀)).
 */

/** Most terms of the series, enough at a/T = 1/2: (1/16)^14/59 < 1e-17 of the first term. */
const SERIES_TERMS = 15;
/** Below this a/T the series; above it the closed form (its cancellation costs at most 2 digits there). */
const SERIES_LIMIT = 0.5;
const MAX_NEWTON = 100;

export class UnlitCooling {
  /** The internal flux's equilibrium a = (q/εσ)^(1/4), K (0 when q = 0). */
  readonly floorK: number;
  /** 2k = 2εσ/C, K⁻³ s⁻¹. */
  private readonly rate: number;
  private readonly a3: number;

  /** `emissionCoefficient` εσ (W m⁻² K⁻⁴), heat capacity C (J m⁻² K⁻¹), internal flux q ≥ 0 (W m⁻²). */
  constructor(
    private readonly emissionCoefficient: number,
    heatCapacityJPerM2K: number,
    private readonly internalFluxWPerM2: number,
  ) {
    this.floorK = Math.sqrt(Math.sqrt(internalFluxWPerM2 / emissionCoefficient));
    this.rate = (2 * emissionCoefficient) / heatCapacityJPerM2K;
    this.a3 = this.floorK ** 3;
  }

  /** G(T) for T > a, K⁻³ (decreasing in T). */
  invariant(temperatureK: number): number {
    const u = this.floorK / temperatureK;
    if (u <= SERIES_LIMIT) {
      const v = u * u * u * u;
      let sum = 0;
      let power = 1;
      // terms fall by v ≤ 1/16 each: stop once one is below 1e-17 of the first
      for (let j = 0; j < SERIES_TERMS && power > 1e-17; j++) {
        sum += power / (4 * j + 3);
        power *= v;
      }
      const inverse = 1 / temperatureK;
      return 2 * inverse * inverse * inverse * sum;
    }
    return (Math.atanh(u) - Math.atan(u)) / this.a3;
  }

  /** dG/dT = −2/(T⁴ − a⁴). */
  private slope(temperatureK: number): number {
    const t2 = temperatureK * temperatureK;
    const a2 = this.floorK * this.floorK;
    return -2 / ((t2 - a2) * (t2 + a2));
  }

  /** dG/dt along the flow: 2εσ/C, K⁻³ s⁻¹ (G(T(t)) = G(T₀) + rate·t). */
  get invariantRate(): number {
    return this.rate;
  }

  /**
   * T after `seconds` of darkness from T₀ > a, K; NaN where T₀ is not above a (a body warming
   * toward its internal-flux floor is left to the integrator).
   */
  after(startK: number, seconds: number): number {
    if (!(startK > this.floorK * (1 + 1e-6)) || !(seconds >= 0)) return Number.NaN;
    if (seconds === 0) return startK;
    return this.temperatureAt(this.invariant(startK) + this.rate * seconds, startK);
  }

  /**
   * The temperature T > a with G(T) = `target`, K, given a temperature `aboveK` at or above it (the
   * night's start). The q = 0 law 2/(3T³) = target bounds it from below (every series term is
   * positive); the series' next term corrects that bound to within ~v²; Newton's method, kept
   * inside the bracket, then converges quadratically and stops once its step is below 1e-8 of
   * T − a (the next error then below 1e-16 of it).
   */
  temperatureAt(target: number, aboveK: number): number {
    const a = this.floorK;
    let lo = Math.max(a, Math.cbrt(2 / (3 * target)));
    if (a === 0) return lo; // exact: G = 2/(3T³)
    let hi = aboveK;
    const u = a / lo;
    let t = u < SERIES_LIMIT ? Math.min(hi, lo * (1 + (u * u * u * u) / 7)) : 0.5 * (lo + hi);
    for (let i = 0; i < MAX_NEWTON; i++) {
      const g = this.invariant(t) - target; // > 0 below the answer, < 0 above it
      if (g > 0) lo = t;
      else if (g < 0) hi = t;
      else return t;
      const step = g / this.slope(t);
      const next = t - step;
      if (next > lo && next < hi) {
        if (Math.abs(step) <= 1e-8 * (t - a) || Math.abs(step) <= 4e-16 * t) return next;
        t = next;
      } else {
        t = 0.5 * (lo + hi);
      }
      if (hi - lo <= 4e-16 * hi) return t;
    }
    return t;
  }

  /** ∂T/∂T₀ along the flow from T₀ to T: (q − εσT⁴)/(q − εσT₀⁴). */
  flowSlope(startK: number, endK: number): number {
    const s2 = startK * startK;
    const e2 = endK * endK;
    return (this.internalFluxWPerM2 - this.emissionCoefficient * e2 * e2) / (this.internalFluxWPerM2 - this.emissionCoefficient * s2 * s2);
  }
}
