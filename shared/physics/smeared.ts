// Smeared charges: δ^{(η)}_c is the uniform probability measure on the sphere ∂B(c, η)
// (the circle in the plane). Newton's theorem gives its potential,
//   2-D (g = −log|x|):  ∫ g(x − y) dδ^{(η)}_c(y) = −log max(|x − c|, η)
//   3-D (g = 1/|x|):    ∫ g(x − y) dδ^{(η)}_c(y) = 1 / max(|x − c|, η),
// and the interaction of two smeared charges is the average of that potential over the
// other sphere. In 3-D the distance r = |y − c| of a uniform point y of a sphere of radius b
// whose centre is at distance D from c has density r/(2bD) on [|D − b|, D + b] (Archimedes'
// hat-box theorem), which gives a closed form. In 2-D the average of −log|y − c| over the
// whole circle is −log max(D, b) (Jensen's formula); the part of the circle inside B(c, a)
// is corrected by an angular integral evaluated with adaptive Gauss–Kronrod quadrature.
// Sources: Lieb & Loss, Analysis, 2nd ed. 2001, Thm 9.7 (Newton's theorem) and ch. 9
// (superharmonic functions); Sandier & Serfaty, 2D Coulomb gases and the renormalized energy,
// Ann. Probab. 43 (2015) (smeared charges);
// Piessens et al., QUADPACK, 1983 (Gauss–Kronrod 7–15 rule, in quadrature.ts).

import { integrateAdaptive } from './quadrature'

/** Potential at distance r from the centre of a smeared charge of radius eta (Newton's theorem). */
export function smearedPotential(d: 2 | 3, r: number, eta: number): number {
  const m = Math.max(r, eta)
  return d === 2 ? -Math.log(m) : 1 / m
}

/** Self-interaction ∬ g dδ^{(η)} dδ^{(η)} = g(η). */
export function smearedSelfEnergy(d: 2 | 3, eta: number): number {
  return d === 2 ? -Math.log(eta) : 1 / eta
}

/** Relative tolerance of the 2-D overlap quadrature. */
export const SMEARED_2D_TOLERANCE = 1e-14

/** ∬ g dδ^{(a)}_x dδ^{(b)}_y for two smeared charges of radii a, b > 0 whose centres are at
 *  distance D ≥ 0. Equals g(D) when D ≥ a + b (disjoint closed balls) and is < g(D) otherwise. */
export function smearedPairEnergy(d: 2 | 3, D: number, a: number, b: number): number {
  if (!(a > 0 && b > 0 && D >= 0) || !Number.isFinite(D + a + b)) {
    throw new RangeError(`smearedPairEnergy: needs radii > 0 and a distance ≥ 0 (got D = ${D}, a = ${a}, b = ${b})`)
  }
  // The average over the sphere ∂B(y, b) of the potential of δ^{(a)}_x (symmetric in a and b).
  return d === 3 ? pair3(D, a, b) : pair2(D, a, b)
}

function pair3(D: number, a: number, b: number): number {
  const lo = Math.abs(D - b)
  const hi = D + b
  if (a <= lo) return 1 / Math.max(D, b)
  if (a >= hi) return 1 / a
  // (1/(2bD)) [∫_lo^a r/a dr + ∫_a^hi dr] = (2 min(D, b) − s²/(2a)) / (2bD), s = a − lo
  const s = a - lo
  return (2 * Math.min(D, b) - (s * s) / (2 * a)) / (2 * b * D)
}

function pair2(D: number, a: number, b: number): number {
  const lo = Math.abs(D - b)
  const hi = D + b
  if (a <= lo) return -Math.log(Math.max(D, b))
  if (a >= hi) return -Math.log(a)
  // y(t) = c_b + b·e^{i(π + t)} seen from c_a: r(t)² = (D − b)² + 4bD sin²(t/2); r(t) < a for |t| < t0.
  const s2 = ((a - D + b) * (a + D - b)) / (4 * b * D)
  const t0 = 2 * Math.asin(Math.min(1, Math.sqrt(s2)))
  const lo2 = lo * lo
  const a2 = a * a
  const fourBD = 4 * b * D
  // log(a / r(t)) ≥ 0 on [0, t0]; near t0 use r² − a² = 4bD sin((t − t0)/2) sin((t + t0)/2).
  const integrand = (t: number): number => {
    const st = Math.sin(0.5 * t)
    const r2 = lo2 + fourBD * st * st
    if (r2 < 0.5 * a2) return 0.5 * Math.log(a2 / r2)
    return -0.5 * Math.log1p((fourBD * Math.sin(0.5 * (t - t0)) * Math.sin(0.5 * (t + t0))) / a2)
  }
  // u = √(t/t0) removes the logarithmic singularity at t = 0 when D = b (the circle passes through c_a).
  const inU = (u: number): number => integrand(t0 * u * u) * 2 * t0 * u
  const q = integrateAdaptive(inU, 0, 1, { relTol: SMEARED_2D_TOLERANCE, absTol: 1e-300 })
  return -Math.log(Math.max(D, b)) - q.value / Math.PI
}
