// Equilibrium measures in closed form for V(x) = a|x|² (sources at the end of this comment), with their
// potentials h^μ(x) = ∫ g(x−y) dμ(y), the constants ∬ g dμ dμ, I_V, c_V, the effective confinement
// ζ = h^μ + V/2 − c_V and the averages of h^μ over spheres ∂B(x, η).
//   d = 1, log: semicircle (a/π)√(R² − x²), R = √(2/a); h = −log(R/2) + ½ − x²/R² on [−R, R] and,
//     with u = |x|/R > 1, h = −log(R/2) + ½ − u/(u + √(u²−1)) − log(u + √(u²−1)) (integral of the
//     Stieltjes transform (2/R²)(z − √(z² − R²))), ζ = u√(u²−1) − arccosh u.
//   d = 2, log: uniform a/π on the disk R = a^(−1/2); h = −log R + ½ − |x|²/(2R²) inside, −log|x|
//     outside. Circle averages: ⟨−log|· − y|⟩_{∂B(x,η)} = −log max(|x − y|, η) (Gauss's mean value /
//     Newton's theorem), so inside the support ⟨h⟩ = h(x) − aη²/2; a circle crossing ∂D splits into an
//     inner arc, where h is quadratic (elementary integral), and an outer arc, where
//     ∫_0^φ log(1 + 2t cos θ + t²) dθ = −2 Im Li₂(−t e^{iφ}) is written with Clausen's function
//     Cl₂ (Lewin, Polylogarithms and Associated Functions, 1981, ch. 5).
//   d = 3, coulomb: uniform 3a/(4π) on the ball R = a^(−1/3); h = (3R² − |x|²)/(2R³) inside, 1/|x|
//     outside; on ∂B(x, η) the distance r to the centre has density r/(2|x|η) on [||x|−η|, |x|+η]
//     (Archimedes), which integrates h in closed form.
//   Riesz |x|^(−s), d − 2 < s < d, V = a|x|²: ρ = Γ(2+s/2) / (π^(d/2) Γ(γ+1) R^(s+2)) (R² − |x|²)₊^γ,
//     γ = 1 + (s−d)/2, a R^(s+2) = s (2/d) Γ((d−s)/2) Γ(2+s/2) / Γ(d/2); inside h = c_V − a|x|²/2 with
//     c_V = a d R²/(2s), ∬ = 2 a d R²/(s(s+4)), I_V = a d R² (s+2)/(s(s+4)); outside
//     h = |x|^(−s) ₂F₁(s/2, γ; 2 + s/2; R²/|x|²) (term-by-term integration of the sphere average
//     |x|^(−s) ₂F₁(s/2, γ; d/2; r²/|x|²) against ρ), summed as a series for R²/|x|² ≤ ½ and otherwise
//     from Euler's integral by tanh–sinh quadrature (accuracy ~1e−13). Sources: Chafaï, Saff &
//     Womersley, J. Math. Anal. Appl. (2022); Borodachov, Hardin & Saff, Discrete Energy on Rectifiable
//     Sets (2019), ch. 4; Landkof, Foundations of Modern Potential Theory (1972), §I.1; Abramowitz &
//     Stegun (1964) 15.3.1.
//   S², uniform σ: ∫|x − y|^(−s) dσ(y) = 2^(1−s)/(2 − s) (s < 2), ∫ −log|x − y| dσ(y) = ½ − log 2
//     (Brauchart, Hardin & Saff, Contemp. Math. 578, 2012; Borodachov, Hardin & Saff 2019, ch. 4).
//   Torus: the uniform measure; with the zero-mean periodic Green function h^μ ≡ 0.
// Saff & Totik, Logarithmic Potentials with External Fields (1997), ch. IV; Forrester, Log-gases and
// Random Matrices (2010), ch. 1.
import type { Kernel } from '../types'
import type { EquilibriumMeasure, Support } from './types'
import { EngineInputError } from '../errors'
import { integrateTanhSinh } from '../quadrature'

// ——— special functions ———

const LANCZOS = [
  0.99999999999980993, 676.5203681218851, -1259.1392167224028, 771.32342877765313, -176.61502916214059,
  12.507343278686905, -0.13857109526572012, 9.9843695780195716e-6, 1.5056327351493116e-7,
]

/** Γ(x) for x > 0 (Lanczos, SIAM J. Numer. Anal. B 1 (1964), g = 7; relative accuracy ~1e−15). */
export function gammaFunction(x: number): number {
  if (!(x > 0)) throw new RangeError(`gammaFunction: x must be > 0 (got ${x})`)
  if (x < 0.5) return Math.PI / (Math.sin(Math.PI * x) * gammaFunction(1 - x))
  const z = x - 1
  let s = LANCZOS[0]
  for (let k = 1; k < 9; k++) s += LANCZOS[k] / (z + k)
  const t = z + 7.5
  return Math.sqrt(2 * Math.PI) * Math.pow(t, z + 0.5) * Math.exp(-t) * s
}

/** ζ(2n) for n = 1 … 40 (ζ(2), ζ(4) exactly; the others by direct summation, converged to rounding). */
const ZETA_EVEN: number[] = (() => {
  const out: number[] = [Math.PI ** 2 / 6, Math.PI ** 4 / 90]
  for (let n = 3; n <= 40; n++) {
    let s = 0
    const K = n === 3 ? 4000 : 300
    for (let k = K; k >= 1; k--) s += Math.pow(k, -2 * n)
    out.push(s)
  }
  return out
})()

/** Clausen's function Cl₂(θ) = Σ_{k≥1} sin(kθ)/k² = −∫_0^θ log|2 sin(t/2)| dt, from
 *  Cl₂(θ) = θ − θ log θ + θ Σ_{n≥1} ζ(2n)/(n(2n+1)) (θ/2π)^(2n) on (0, π] and its symmetries
 *  (Lewin 1981, ch. 4; Abramowitz & Stegun 27.8). */
export function clausen2(theta: number): number {
  const twoPi = 2 * Math.PI
  let t = theta % twoPi
  if (t < 0) t += twoPi
  let sign = 1
  if (t > Math.PI) {
    t = twoPi - t
    sign = -1
  }
  if (t === 0) return 0
  const u = (t / twoPi) ** 2
  let power = 1
  let s = 0
  for (let n = 1; n <= 40; n++) {
    power *= u
    const c = (ZETA_EVEN[n - 1] / (n * (2 * n + 1))) * power
    s += c
    if (c < 1e-17 * s) break
  }
  return sign * t * (1 - Math.log(t) + s)
}

/** ∫_0^φ log(1 + 2t cos θ + t²) dθ for 0 ≤ t ≤ 1, 0 ≤ φ ≤ π: −2 Im Li₂(−t e^{iφ}), with
 *  Im Li₂(r e^{iα}) = ω log r + ½[Cl₂(2α) + Cl₂(2ω) − Cl₂(2α + 2ω)], ω = arg(1 − r e^{iα}) (Lewin 1981, (5.5)). */
export function logArcIntegral(t: number, phi: number): number {
  if (t === 0 || phi === 0) return 0
  const alpha = phi + Math.PI
  const omega = Math.atan2(-t * Math.sin(phi), 1 + t * Math.cos(phi))
  const im = omega * Math.log(t) + 0.5 * (clausen2(2 * alpha) + clausen2(2 * omega) - clausen2(2 * alpha + 2 * omega))
  return -2 * im
}

/** ₂F₁(α, β; γ; u) for 0 ≤ u ≤ 1 with γ > β > 0 (series for u ≤ ½, else Euler's integral
 *  Γ(γ)/(Γ(β)Γ(γ−β)) ∫_0^1 t^(β−1)(1−t)^(γ−β−1)(1−ut)^(−α) dt, with t = w^(1/β)). */
export function hypergeometric2F1(alpha: number, beta: number, gamma: number, u: number): number {
  if (Math.abs(beta) < 1e-15 || u === 0) return 1
  if (u <= 0.5) {
    let term = 1
    let s = 1
    for (let k = 0; k < 200; k++) {
      term *= ((alpha + k) * (beta + k) / ((gamma + k) * (k + 1))) * u
      s += term
      if (Math.abs(term) < 1e-17 * Math.abs(s)) break
    }
    return s
  }
  if (!(beta > 0 && gamma > beta)) throw new RangeError(`hypergeometric2F1: needs γ > β > 0 for u > ½ (got β = ${beta}, γ = ${gamma})`)
  const p = gamma - beta - 1
  const f = (w: number): number => {
    const t = Math.pow(w, 1 / beta)
    if (!(t < 1)) return 0 // (1 − t)^p → 0 there (p = γ − β − 1 > 0 for the Riesz exteriors, γ − α − β > 0)
    return Math.pow(1 - t, p) * Math.pow(1 - u * t, -alpha)
  }
  const integral = integrateTanhSinh(f, 0, 1, { tol: 1e-15, maxLevels: 12 }).value
  return (gammaFunction(gamma) / (gammaFunction(beta + 1) * gammaFunction(gamma - beta))) * integral
}

// ——— helpers ———

function norm(points: ArrayLike<number>, offset: number, d: number): number {
  if (d === 1) return Math.abs(points[offset])
  let s = 0
  for (let k = 0; k < d; k++) s += points[offset + k] * points[offset + k]
  return Math.sqrt(s)
}

function checkScale(a: number, what: string): void {
  if (!(a > 0) || !Number.isFinite(a)) throw new EngineInputError(`${what}: the quadratic coefficient a in V = a|x|² must be a finite number > 0 (got ${a})`)
}

function checkEta(eta: number): void {
  if (!(eta >= 0) || !Number.isFinite(eta)) throw new EngineInputError(`the radius η of a sphere average must be a finite number ≥ 0 (got ${eta})`)
}

interface RadialPieces {
  d: number
  kernel: Kernel
  support: Support
  source: string
  accuracy: number
  selfEnergy: number
  IV: number
  cV: number
  a: number
  R: number
  densityAt(r: number): number
  /** h as a function of r = |x|. */
  h(r: number): number
  /** ζ as a function of r = |x| (zero on the support). */
  zeta(r: number): number
  /** ⟨h⟩ over ∂B(x, η) with |x| = r, for η > 0. */
  average(r: number, eta: number): number
}

function radialMeasure(p: RadialPieces): EquilibriumMeasure {
  const { d } = p
  return {
    d,
    kernel: p.kernel,
    support: p.support,
    method: 'closed-form',
    accuracy: p.accuracy,
    source: p.source,
    selfEnergy: p.selfEnergy,
    IV: p.IV,
    cV: p.cV,
    density: (points, offset = 0) => p.densityAt(norm(points, offset, d)),
    potential: (points, offset = 0) => p.h(norm(points, offset, d)),
    zeta: (points, offset = 0) => p.zeta(norm(points, offset, d)),
    sphereAverage: (points, offset, eta) => {
      checkEta(eta)
      const r = norm(points, offset ?? 0, d)
      if (eta === 0) return p.h(r)
      if (r + eta <= p.R) return p.h(r) - (p.a * eta * eta) / 2 // h quadratic on the support
      return p.average(r, eta)
    },
  }
}

// ——— d = 1, log: semicircle ———

/** The semicircle law for g = −log|x|, V = a x² on the line. */
export function semicircleMeasure(a: number): EquilibriumMeasure {
  checkScale(a, 'semicircle')
  const R = Math.sqrt(2 / a)
  const base = -Math.log(R / 2) + 0.5
  const h = (r: number): number => {
    if (r <= R) return base - (r * r) / (R * R)
    const u = r / R
    const w = Math.sqrt((u - 1) * (u + 1))
    return base - u / (u + w) - Math.log(u + w)
  }
  return radialMeasure({
    d: 1,
    kernel: { name: 'log' },
    support: { kind: 'ball', center: [0], radius: R },
    source: 'Wigner semicircle law: Saff & Totik, Logarithmic Potentials with External Fields (1997), ch. IV; Forrester, Log-gases and Random Matrices (2010), ch. 1',
    accuracy: 0,
    selfEnergy: -Math.log(R / 2) + 0.25,
    IV: -Math.log(R / 2) + 0.75,
    cV: base,
    a,
    R,
    densityAt: r => (r < R ? (a / Math.PI) * Math.sqrt((R - r) * (R + r)) : 0),
    h,
    zeta: (r) => {
      if (r <= R) return 0
      const u = r / R
      const w = Math.sqrt((u - 1) * (u + 1))
      return u * w - Math.log(u + w)
    },
    average: (r, eta) => 0.5 * (h(Math.abs(r - eta)) + h(r + eta)),
  })
}

/** For the line embedded in the plane (d = 1; Sandier & Serfaty, "1D log gases and the renormalized energy",
 *  Probab. Theory Relat. Fields 162, 2015): the average of the planar potential
 *  U(z) = ∫ −log|z − y| dμ(y) of the semicircle law over the circle of radius η about (x, 0). By Newton's
 *  theorem it is ∫ −log max(|x − y|, η) dμ(y) = h(x) − ∫_{|y−x|<η} log(η/|x − y|) dμ(y); the last integral
 *  is taken by tanh–sinh quadrature with the logarithmic singularity at an endpoint (accuracy ~1e−14). */
export function semicirclePlanarCircleAverage(a: number, x: number, eta: number): number {
  checkScale(a, 'semicircle')
  checkEta(eta)
  const mu = semicircleMeasure(a)
  const R = Math.sqrt(2 / a)
  const h = mu.potential([x])
  if (eta === 0) return h
  const rho = (y: number): number => (Math.abs(y) < R ? (a / Math.PI) * Math.sqrt((R - y) * (R + y)) : 0)
  let correction = 0
  // y = x − v and y = x + v, v from 0 to η, clipped to [−R, R]
  for (const sign of [-1, 1]) {
    const lo = Math.max(0, sign < 0 ? x - R : -R - x)
    const hi = Math.min(eta, sign < 0 ? x + R : R - x)
    if (hi > lo) correction += integrateTanhSinh(v => (v > 0 ? Math.log(eta / v) * rho(x + sign * v) : 0), lo, hi, { tol: 1e-15 }).value
  }
  return h - correction
}

// ——— d = 2, log: uniform disk ———

/** ⟨h⟩ over the circle ∂B(x, η), |x| = ρ, for the uniform probability on the disk of radius R (log kernel). */
export function diskCircleAverage(R: number, rho: number, eta: number): number {
  const c = -Math.log(R) + 0.5
  if (rho + eta <= R) return c - (rho * rho + eta * eta) / (2 * R * R)
  if (eta >= rho + R) return -Math.log(eta) // the disk lies inside the circle
  if (rho >= eta + R) return -Math.log(rho) // the disk lies outside the circle
  // The circle crosses ∂D: |z|² = ρ² + η² + 2ρη cos θ exceeds R² for |θ| < θ0.
  const kappa = (R * R - rho * rho - eta * eta) / (2 * rho * eta)
  const theta0 = Math.acos(Math.min(1, Math.max(-1, kappa)))
  const inner = Math.PI - theta0
  const M = Math.max(rho, eta)
  const t = Math.min(rho, eta) / M
  const P = 2 * theta0 * Math.log(M) + logArcIntegral(t, theta0) // ∫_0^θ0 log|z|² dθ
  const insidePart = 2 * inner * c - (2 * inner * (rho * rho + eta * eta) - 4 * rho * eta * Math.sin(theta0)) / (2 * R * R)
  return (insidePart - P) / (2 * Math.PI)
}

/** The uniform measure a/π on the disk of radius a^(−1/2): g = −log|x|, V = a|x|² in the plane. */
export function uniformDiskMeasure(a: number): EquilibriumMeasure {
  checkScale(a, 'disk')
  const R = 1 / Math.sqrt(a)
  const c = -Math.log(R) + 0.5
  return radialMeasure({
    d: 2,
    kernel: { name: 'log' },
    support: { kind: 'ball', center: [0, 0], radius: R },
    source: 'uniform disk (circular law): Saff & Totik, Logarithmic Potentials with External Fields (1997), ch. IV; Forrester, Log-gases and Random Matrices (2010), ch. 1',
    accuracy: 0,
    selfEnergy: -Math.log(R) + 0.25,
    IV: -Math.log(R) + 0.75,
    cV: c,
    a,
    R,
    densityAt: r => (r <= R ? a / Math.PI : 0),
    h: r => (r <= R ? c - (r * r) / (2 * R * R) : -Math.log(r)),
    zeta: (r) => {
      if (r <= R) return 0
      const u = r / R
      return ((u - 1) * (u + 1)) / 2 - Math.log1p(u - 1)
    },
    average: (r, eta) => diskCircleAverage(R, r, eta),
  })
}

// ——— d = 3, coulomb: uniform ball ———

/** ⟨h⟩ over the sphere ∂B(x, η), |x| = ρ, for the uniform probability on the ball of radius R (kernel 1/|x|).
 *  Written as the average of the interior quadratic, (3R² − ρ² − η²)/(2R³), plus that of the exterior excess
 *  ζ(r) = (r − R)²(r + 2R)/(2R³ r), which is integrated against r dr/(2ρη) on [R, ρ + η] in closed form
 *  (no cancellation for small η near the edge). */
export function ballSphereAverage(R: number, rho: number, eta: number): number {
  const quadratic = (3 * R * R - rho * rho - eta * eta) / (2 * R * R * R)
  if (rho + eta <= R) return quadratic
  const lo = Math.abs(rho - eta)
  if (lo >= R) return 1 / Math.max(rho, eta)
  const U = rho + eta - R // ∫_0^U u²(u + 3R) du / (2R³) with u = r − R
  return quadratic + (U * U * U * (U / 4 + R)) / (2 * R * R * R * 2 * rho * eta)
}

/** The uniform measure 3a/(4π) on the ball of radius a^(−1/3): g = 1/|x|, V = a|x|² in R³. */
export function uniformBallMeasure(a: number, kernel: Kernel = { name: 'coulomb' }): EquilibriumMeasure {
  checkScale(a, 'ball')
  const R = Math.cbrt(1 / a)
  return radialMeasure({
    d: 3,
    kernel,
    support: { kind: 'ball', center: [0, 0, 0], radius: R },
    source: 'uniform ball, μ = ΔV/(2c₃) (Newton\'s theorem): Landkof, Foundations of Modern Potential Theory (1972), ch. I',
    accuracy: 0,
    selfEnergy: 6 / (5 * R),
    IV: 9 / (5 * R),
    cV: 3 / (2 * R),
    a,
    R,
    densityAt: r => (r <= R ? (3 * a) / (4 * Math.PI) : 0),
    h: r => (r <= R ? (3 * R * R - r * r) / (2 * R * R * R) : 1 / r),
    zeta: (r) => {
      if (r <= R) return 0
      const u = r / R
      return ((u - 1) * (u - 1) * (u + 2)) / (2 * u * R)
    },
    average: (r, eta) => ballSphereAverage(R, r, eta),
  })
}

// ——— Riesz, d − 2 < s < d ———

/** The Riesz equilibrium measure for g = |x|^(−s), V = a|x|², d − 2 < s < d (d = 1, 2, 3). */
export function rieszBallMeasure(d: 1 | 2 | 3, s: number, a: number): EquilibriumMeasure {
  checkScale(a, 'riesz ball')
  if (!(s > Math.max(0, d - 2) && s < d)) throw new EngineInputError(`the Riesz closed form needs max(0, d − 2) < s < d (got s = ${s}, d = ${d}); s = d − 2 is the Coulomb case`)
  const gam = 1 + (s - d) / 2
  const Rs2 = (s * (2 / d) * gammaFunction((d - s) / 2) * gammaFunction(2 + s / 2)) / gammaFunction(d / 2) / a
  const R = Math.pow(Rs2, 1 / (s + 2))
  const R2 = R * R
  const cV = (a * d * R2) / (2 * s)
  const pref = gammaFunction(2 + s / 2) / (Math.pow(Math.PI, d / 2) * gammaFunction(gam + 1) * Rs2)
  const h = (r: number): number => {
    if (r <= R) return cV - (a * r * r) / 2
    return Math.pow(r, -s) * hypergeometric2F1(s / 2, gam, 2 + s / 2, R2 / (r * r))
  }
  const zeta = (r: number): number => (r <= R ? 0 : Math.max(0, h(r) + (a * r * r) / 2 - cV))
  // ⟨h⟩ = ⟨c_V − a|z|²/2⟩ + ⟨ζ⟩ = c_V − a(r² + η²)/2 + ⟨ζ⟩, with ζ = 0 on the support.
  const average = (r: number, eta: number): number => {
    const quadraticPart = cV - (a * (r * r + eta * eta)) / 2
    if (d === 1) return quadraticPart + 0.5 * (zeta(Math.abs(r - eta)) + zeta(r + eta))
    if (r === 0) return quadraticPart + zeta(eta)
    if (d === 3) {
      // |z| has density |z|/(2rη) on [|r − η|, r + η] (Archimedes)
      const lo = Math.max(Math.abs(r - eta), R)
      const hi = r + eta
      if (hi <= lo) return quadraticPart
      return quadraticPart + integrateTanhSinh(x => zeta(x) * x, lo, hi, { tol: 1e-14 }).value / (2 * r * eta)
    }
    // d = 2: |z|² = r² + η² + 2rη cos θ exceeds R² for θ < θ0 (average over θ ∈ [0, π] by symmetry)
    const kappa = (R2 - r * r - eta * eta) / (2 * r * eta)
    if (kappa >= 1) return quadraticPart
    const theta0 = kappa <= -1 ? Math.PI : Math.acos(kappa)
    const z = (theta: number): number => Math.sqrt(Math.max(0, r * r + eta * eta + 2 * r * eta * Math.cos(theta)))
    return quadraticPart + integrateTanhSinh(theta => zeta(z(theta)), 0, theta0, { tol: 1e-14 }).value / Math.PI
  }
  return radialMeasure({
    d,
    kernel: { name: 'riesz', s },
    support: { kind: 'ball', center: new Array<number>(d).fill(0), radius: R },
    source: 'Riesz equilibrium measure for a|x|²: Chafaï, Saff & Womersley, J. Math. Anal. Appl. (2022); Borodachov, Hardin & Saff, Discrete Energy on Rectifiable Sets (2019), ch. 4',
    accuracy: 1e-12,
    selfEnergy: (2 * a * d * R2) / (s * (s + 4)),
    IV: (a * d * R2 * (s + 2)) / (s * (s + 4)),
    cV,
    a,
    R,
    densityAt: r => (r < R ? pref * Math.pow((R - r) * (R + r), gam) : 0),
    h,
    zeta,
    average,
  })
}

// ——— sphere and torus: uniform measures ———

/** The uniform probability on S² for the log kernel or the Riesz kernel |x|^(−s), 0 < s < 2 (coulomb: s = 1).
 *  h^μ is constant on S²; the potential is defined on S² only. */
export function sphereUniformMeasure(kernel: Kernel): EquilibriumMeasure {
  let value: number
  if (kernel.name === 'log') value = 0.5 - Math.log(2)
  else {
    const s = kernel.name === 'coulomb' ? 1 : kernel.s
    if (!(s > 0 && s < 2)) throw new EngineInputError(`on S² the continuous Riesz energy is finite only for 0 < s < 2 (got s = ${s})`)
    value = Math.pow(2, 1 - s) / (2 - s)
  }
  const onSphere = (points: ArrayLike<number>, offset: number): void => {
    const r = norm(points, offset, 3)
    if (!(Math.abs(r - 1) <= 1e-9)) throw new EngineInputError(`the potential of the uniform measure on S² is evaluated on S² only (|x| = ${r})`)
  }
  return {
    d: 3,
    kernel,
    support: { kind: 'whole' },
    method: 'closed-form',
    accuracy: 0,
    source: 'uniform measure on S²: Brauchart, Hardin & Saff, Contemp. Math. 578 (2012); Borodachov, Hardin & Saff, Discrete Energy on Rectifiable Sets (2019), ch. 4',
    selfEnergy: value,
    IV: value,
    cV: value,
    density: (points, offset = 0) => {
      onSphere(points, offset)
      return 1 / (4 * Math.PI)
    },
    potential: (points, offset = 0) => {
      onSphere(points, offset)
      return value
    },
    // The average of the constant h^μ over the circle ∂B(x, η) ∩ S².
    sphereAverage: (points, offset, eta) => {
      checkEta(eta)
      onSphere(points, offset ?? 0)
      return value
    },
    zeta: (points, offset = 0) => {
      onSphere(points, offset)
      return 0
    },
  }
}

/** The uniform measure on the torus [0, L)^d: with the zero-mean periodic Green function h^μ ≡ 0,
 *  ∬ = I_V = c_V = 0 (the background is built into the periodic energy). */
export function torusUniformMeasure(d: number, L: number, kernel: Kernel): EquilibriumMeasure {
  if (!(L > 0) || !Number.isFinite(L)) throw new EngineInputError(`the torus side L must be a finite number > 0 (got ${L})`)
  return {
    d,
    kernel,
    support: { kind: 'whole' },
    method: 'closed-form',
    accuracy: 0,
    source: 'uniform background of the periodic (jellium) energy: Sandier & Serfaty, Ann. Probab. 43 (2015); zero-mean periodic Green function by Ewald summation (Ewald, Ann. Phys. 369, 1921)',
    selfEnergy: 0,
    IV: 0,
    cV: 0,
    density: () => Math.pow(L, -d),
    potential: () => 0,
    sphereAverage: (_points, _offset, eta) => {
      checkEta(eta)
      return 0
    },
    zeta: () => 0,
  }
}
