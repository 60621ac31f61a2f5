// Test-only equilibrium measures with closed-form potentials, built here so that the electric
// energy tests do not depend on the engine's own equilibrium module.
//   uniform disk (d = 2, g = −log|x|, radius R, density 1/(πR²)):
//     h(x) = ½ − log R − |x|²/(2R²) for |x| ≤ R, −log|x| outside; ∬ g dμ dμ = ¼ − log R
//   uniform ball (d = 3, g = 1/|x|, radius R, density 3/(4πR³)):
//     h(x) = 3/(2R) − |x|²/(2R³) for |x| ≤ R, 1/|x| outside; ∬ g dμ dμ = 6/(5R)
//   semicircle (d = 1, g = −log|x|, radius R, density (2/(πR²))√(R² − x²)):
//     h(x) = ½ − log(R/2) − x²/R² on [−R, R]; outside from the Stieltjes transform
//     G(z) = (2/R²)(z − √(z² − R²)); ∬ g dμ dμ = ¼ − log(R/2)
// Derivations: −Δh = c_d·density inside, continuity with the point-charge potential at |x| = R
// (Gauss's law); semicircle: Saff & Totik, Logarithmic Potentials with External Fields, 1997,
// §IV.5, and Forrester, Log-gases and Random Matrices, 2010, §1.4. Circle averages across the
// disk's edge use composite Gauss–Legendre quadrature (nodes by Newton's method on P_n).
import type { EquilibriumMeasure } from '../../shared/physics/equilibrium/types'

/** Gauss–Legendre nodes and weights on [−1, 1] (Newton iteration on the Legendre recurrence). */
export function gaussLegendre(n: number): { x: Float64Array, w: Float64Array } {
  const x = new Float64Array(n)
  const w = new Float64Array(n)
  for (let i = 0; i < n; i++) {
    let z = Math.cos((Math.PI * (i + 0.75)) / (n + 0.5))
    let dp = 0
    for (let it = 0; it < 100; it++) {
      let p0 = 1
      let p1 = z
      for (let k = 2; k <= n; k++) {
        const p2 = ((2 * k - 1) * z * p1 - (k - 1) * p0) / k
        p0 = p1
        p1 = p2
      }
      dp = (n * (z * p1 - p0)) / (z * z - 1)
      const dz = p1 / dp
      z -= dz
      if (Math.abs(dz) < 1e-16) break
    }
    x[i] = z
    w[i] = 2 / ((1 - z * z) * dp * dp)
  }
  return { x, w }
}

const GL20 = gaussLegendre(20)

/** ∫_a^b f by composite 20-point Gauss–Legendre on `panels` equal panels. */
export function compositeGL(f: (t: number) => number, a: number, b: number, panels = 32): number {
  let s = 0
  const h = (b - a) / panels
  for (let p = 0; p < panels; p++) {
    const c = a + (p + 0.5) * h
    for (let k = 0; k < 20; k++) s += GL20.w[k] * f(c + 0.5 * h * GL20.x[k])
  }
  return 0.5 * h * s
}

function norm(points: ArrayLike<number>, offset: number, d: number): number {
  let t = 0
  for (let c = 0; c < d; c++) t += points[offset + c] * points[offset + c]
  return Math.sqrt(t)
}

export function uniformDisk(R = 1): EquilibriumMeasure {
  const h = (r: number): number => (r <= R ? 0.5 - Math.log(R) - (r * r) / (2 * R * R) : -Math.log(r))
  return {
    d: 2,
    kernel: { name: 'log' },
    support: { kind: 'ball', center: [0, 0], radius: R },
    method: 'closed-form',
    accuracy: 0,
    source: 'test factory: uniform disk',
    selfEnergy: 0.25 - Math.log(R),
    IV: 0.75 - Math.log(R),
    cV: 0.5 - Math.log(R),
    density: (p, o = 0) => (norm(p, o, 2) <= R ? 1 / (Math.PI * R * R) : 0),
    potential: (p, o = 0) => h(norm(p, o, 2)),
    zeta: () => 0,
    sphereAverage(p, o, eta) {
      const rho = norm(p, o, 2)
      // |y|² = ρ² + η² + 2ρη cos θ; inside the disk where cos θ < c
      const c = rho > 0 ? (R * R - rho * rho - eta * eta) / (2 * rho * eta) : (eta <= R ? 2 : -2)
      const inside = (th0: number): number => // (1/2π) ∫_{θ0}^{2π−θ0} of the quadratic branch
        ((2 * Math.PI - 2 * th0) * (0.5 - Math.log(R) - (rho * rho + eta * eta) / (2 * R * R)) + ((rho * eta) / (R * R)) * 2 * Math.sin(th0)) / (2 * Math.PI)
      if (c >= 1) return inside(0)
      const outside = (th0: number): number =>
        (2 * compositeGL(t => -0.5 * Math.log(rho * rho + eta * eta + 2 * rho * eta * Math.cos(t)), 0, th0)) / (2 * Math.PI)
      if (c <= -1) return outside(Math.PI)
      const th0 = Math.acos(c)
      return inside(th0) + outside(th0)
    },
  }
}

export function uniformBall(R = 1): EquilibriumMeasure {
  const h = (r: number): number => (r <= R ? 3 / (2 * R) - (r * r) / (2 * R * R * R) : 1 / r)
  // antiderivatives of h(r)·r
  const Fin = (r: number): number => (3 * r * r) / (4 * R) - (r * r * r * r) / (8 * R * R * R)
  return {
    d: 3,
    kernel: { name: 'coulomb' },
    support: { kind: 'ball', center: [0, 0, 0], radius: R },
    method: 'closed-form',
    accuracy: 0,
    source: 'test factory: uniform ball',
    selfEnergy: 6 / (5 * R),
    IV: 9 / (5 * R),
    cV: 3 / (2 * R),
    density: (p, o = 0) => (norm(p, o, 3) <= R ? 3 / (4 * Math.PI * R * R * R) : 0),
    potential: (p, o = 0) => h(norm(p, o, 3)),
    zeta: () => 0,
    sphereAverage(p, o, eta) {
      const rho = norm(p, o, 3)
      if (rho === 0) return h(eta)
      // |y| has density r/(2ηρ) on [|ρ − η|, ρ + η] (Archimedes)
      const lo = Math.abs(rho - eta)
      const hi = rho + eta
      let s = 0
      if (lo < R) s += Fin(Math.min(R, hi)) - Fin(lo)
      if (hi > R) s += hi - Math.max(lo, R)
      return s / (2 * eta * rho)
    },
  }
}

export function semicircle(R = Math.SQRT2): EquilibriumMeasure {
  const c = 0.5 - Math.log(R / 2)
  const h = (x: number): number => {
    const ax = Math.abs(x)
    if (ax <= R) return c - (x * x) / (R * R)
    const s = Math.sqrt(ax * ax - R * R)
    return c - 1 - (ax * ax - R * R) / (R * R) + (ax * s) / (R * R) - Math.log((ax + s) / R)
  }
  return {
    d: 1,
    kernel: { name: 'log' },
    support: { kind: 'ball', center: [0], radius: R },
    method: 'closed-form',
    accuracy: 0,
    source: 'test factory: semicircle',
    selfEnergy: 0.25 - Math.log(R / 2),
    IV: 0.75 - Math.log(R / 2),
    cV: c,
    density: (p, o = 0) => {
      const x = p[o]
      return Math.abs(x) < R ? (2 / (Math.PI * R * R)) * Math.sqrt(R * R - x * x) : 0
    },
    potential: (p, o = 0) => h(p[o]),
    zeta: () => 0,
    sphereAverage: (p, o, eta) => 0.5 * (h(p[o] - eta) + h(p[o] + eta)),
  }
}

/** F_N = Σ_{i≠j} g(x_i − x_j) − 2N Σ h^μ(x_i) + N² ∬ g dμ dμ (Sandier & Serfaty, Ann. Probab. 43, 2015),
 *  directly from its definition. */
export function nextOrderEnergy(points: ArrayLike<number>, d: number, measure: EquilibriumMeasure): number {
  const N = points.length / d
  let pairs = 0
  for (let i = 0; i < N; i++) {
    for (let j = 0; j < N; j++) {
      if (i === j) continue
      let r2 = 0
      for (let c = 0; c < d; c++) r2 += (points[i * d + c] - points[j * d + c]) ** 2
      pairs += d === 3 ? 1 / Math.sqrt(r2) : -0.5 * Math.log(r2)
    }
  }
  let h = 0
  for (let i = 0; i < N; i++) h += measure.potential(points, i * d)
  return pairs - 2 * N * h + N * N * measure.selfEnergy
}

/** A small seeded generator (mulberry32; common practice) returning numbers in [0, 1). */
export function seeded(seed: number): () => number {
  let a = seed >>> 0
  return () => {
    a = (a + 0x6d2b79f5) >>> 0
    let t = a
    t = Math.imul(t ^ (t >>> 15), t | 1)
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61)
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296
  }
}

/** N points uniform in the ball of radius r (d = 1, 2, 3), flat, by rejection. */
export function pointsInBall(N: number, d: number, r: number, rand: () => number): Float64Array {
  const out = new Float64Array(N * d)
  for (let i = 0; i < N; i++) {
    for (;;) {
      let s = 0
      for (let c = 0; c < d; c++) {
        const v = (2 * rand() - 1) * r
        out[i * d + c] = v
        s += v * v
      }
      if (s <= r * r) break
    }
  }
  return out
}
