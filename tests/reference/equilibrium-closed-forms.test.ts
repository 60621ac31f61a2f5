// Closed-form equilibrium measures for V = a|x|² (sources in shared/physics/equilibrium/closed-forms.ts and
// in each block) against their published constants and
// against independent numerical quadrature of the defining integrals.
import { describe, it, expect } from 'vitest'
import {
  ballSphereAverage,
  clausen2,
  diskCircleAverage,
  gammaFunction,
  hypergeometric2F1,
  logArcIntegral,
  rieszBallMeasure,
  semicircleMeasure,
  semicirclePlanarCircleAverage,
  sphereUniformMeasure,
  uniformBallMeasure,
  uniformDiskMeasure,
} from '../../shared/physics/equilibrium/closed-forms'
import { equilibriumMeasure, registerNumericalSolver } from '../../shared/physics/equilibrium/index'
import type { EquilibriumMeasure } from '../../shared/physics/equilibrium/types'
import { gaussLegendreOn } from '../../shared/physics/quadrature'
import { EngineInputError } from '../../shared/physics/errors'
import type { Potential } from '../../shared/physics/potentials/types'
import { quadraticPotential } from '../../shared/physics/potentials/presets'

/** Tanh–sinh rule with a fixed step 1/64 on t ∈ [−3.2, 3.2] (Takahasi & Mori 1974), after x = a + (b − a)w²
 *  which softens an algebraic singularity at a; nodes that round onto an endpoint are skipped (their weight
 *  is below 1e−30), so integrable endpoint singularities are safe. */
function ts(f: (x: number) => number, a: number, b: number): number {
  return tanhSinh(w => 2 * w * (b - a) * f(a + (b - a) * w * w), 0, 1)
}
function tanhSinh(f: (x: number) => number, a: number, b: number): number {
  const h = (b - a) / 2
  const step = 1 / 64
  let s = 0
  for (let k = -205; k <= 205; k++) {
    const t = k * step
    const u = (Math.PI / 2) * Math.sinh(t)
    const gap = 2 / (Math.exp(2 * Math.abs(u)) + 1)
    const x = u >= 0 ? b - h * gap : a + h * gap
    if (!(x > a && x < b)) continue
    const cu = Math.cosh(u)
    s += ((Math.PI / 2) * Math.cosh(t) / (cu * cu)) * f(x)
  }
  return s * step * h
}
/** Complete elliptic integral K(k) by the arithmetic–geometric mean, K = π / (2 AGM(1, √(1 − k²)))
 *  (Abramowitz & Stegun 17.6). */
function ellipticK(kc: number): number {
  // kc = √(1 − k²), the complementary modulus
  let a = 1
  let b = kc
  for (let i = 0; i < 40 && Math.abs(a - b) > 1e-16 * a; i++) [a, b] = [(a + b) / 2, Math.sqrt(a * b)]
  return Math.PI / (2 * a)
}
function gl(f: (x: number) => number, a: number, b: number, n = 64): number {
  const { nodes, weights } = gaussLegendreOn(n, a, b)
  let s = 0
  for (let i = 0; i < n; i++) s += weights[i] * f(nodes[i])
  return s
}
/** Composite Gauss–Legendre with `panels` equal panels. */
function glc(f: (x: number) => number, a: number, b: number, panels: number, n = 16): number {
  let s = 0
  const h = (b - a) / panels
  for (let k = 0; k < panels; k++) s += gl(f, a + k * h, a + (k + 1) * h, n)
  return s
}

// The engine's quadratic preset V = a|x|² (its own tests are in tests/unit/physics/potentials.test.ts).
const quadratic = quadraticPotential

/** A point at distance r from the origin in a fixed generic direction. */
function at(d: number, r: number): Float64Array {
  if (d === 1) return Float64Array.from([r])
  if (d === 2) return Float64Array.from([r * 0.6, r * 0.8])
  return Float64Array.from([r * 2 / 7, r * 3 / 7, r * 6 / 7])
}

// ——— special functions used by the closed forms ———

describe('special functions', () => {
  it('Γ at known points', () => {
    // Γ(1/2) = √π, Γ(5) = 24, Γ(3/2) = √π/2 (Abramowitz & Stegun 6.1.8, 6.1.6)
    expect(gammaFunction(0.5)).toBeCloseTo(Math.sqrt(Math.PI), 14)
    expect(gammaFunction(5)).toBeCloseTo(24, 12)
    expect(gammaFunction(1.5) / (Math.sqrt(Math.PI) / 2)).toBeCloseTo(1, 14)
    expect(gammaFunction(0.1) / (9.513507698668732)).toBeCloseTo(1, 13) // Γ(0.1) (value recalled from memory)
  })

  it('Cl₂(θ) = −∫_0^θ log(2 sin(t/2)) dt (Lewin 1981, (4.2)), by quadrature', () => {
    for (const theta of [0.05, 0.7, Math.PI / 3, 2, 3, Math.PI]) {
      const q = -ts(t => Math.log(2 * Math.sin(t / 2)), 0, theta)
      expect(Math.abs(clausen2(theta) - q)).toBeLessThan(2e-14)
    }
    // odd and 2π-periodic
    expect(clausen2(-1.3)).toBeCloseTo(-clausen2(1.3), 15)
    expect(clausen2(1.3 + 2 * Math.PI)).toBeCloseTo(clausen2(1.3), 14)
    expect(clausen2(2 * Math.PI - 0.4)).toBeCloseTo(-clausen2(0.4), 15)
  })

  it('∫_0^φ log(1 + 2t cos θ + t²) dθ in closed form matches quadrature', () => {
    for (const [t, phi] of [[0.2, 1], [0.7, 2.5], [0.99, 3.1], [1, 2], [1, Math.PI - 1e-3], [0.999999, 3.14]]) {
      const f = (th: number): number => Math.log(1 + 2 * t * Math.cos(th) + t * t)
      const q = t === 1 || t > 0.9999 ? ts(f, 0, phi) : gl(f, 0, phi, 200)
      expect(Math.abs(logArcIntegral(t, phi) - q)).toBeLessThan(1e-12)
    }
  })

  it('₂F₁ by its series and by Euler\'s integral agree across u = ½', () => {
    // both branches against a direct series summed with many terms at u = 0.6, 0.9
    for (const [a, b, c] of [[0.25, 0.75, 2.25], [0.5, 0.25, 2.5], [0.75, 0.25, 2.75]]) {
      for (const u of [0.45, 0.6, 0.9]) {
        let term = 1
        let s = 1
        for (let k = 0; k < 4000; k++) {
          term *= ((a + k) * (b + k) / ((c + k) * (k + 1))) * u
          s += term
        }
        expect(Math.abs(hypergeometric2F1(a, b, c, u) - s)).toBeLessThan(1e-13)
      }
      // Gauss: ₂F₁(a, b; c; 1) = Γ(c)Γ(c−a−b)/(Γ(c−a)Γ(c−b)) (Abramowitz & Stegun 15.1.20)
      const gauss = gammaFunction(c) * gammaFunction(c - a - b) / (gammaFunction(c - a) * gammaFunction(c - b))
      expect(Math.abs(hypergeometric2F1(a, b, c, 1) - gauss)).toBeLessThan(1e-12)
    }
  })
})

// ——— d = 1: semicircle ———

/** h(x) = −∫ log|x − y| dμ(y) for the semicircle of radius R, y = R sin φ, split at the singularity. */
function semicircleH(R: number, x: number): number {
  const w = (phi: number): number => (2 / Math.PI) * Math.cos(phi) ** 2 // ρ(y)dy/dφ for mass 1
  const f = (phi: number): number => {
    const gap = Math.abs(x - R * Math.sin(phi))
    return gap === 0 ? 0 : -Math.log(gap) * w(phi) // a node rounding onto the singularity carries no weight
  }
  if (Math.abs(x) >= R) return ts(f, -Math.PI / 2, Math.PI / 2)
  const px = Math.asin(x / R)
  return ts(f, -Math.PI / 2, px) + ts(f, px, Math.PI / 2)
}

describe('semicircle law (d = 1, log, V = a x²)', () => {
  it('a = 1: ∬ = ½ log 2 + ¼, I_V = ½ log 2 + ¾ (Saff & Totik 1997; Forrester 2010), also by quadrature', () => {
    const mu = semicircleMeasure(1)
    expect(mu.selfEnergy).toBeCloseTo(0.5 * Math.log(2) + 0.25, 15)
    expect(mu.IV).toBeCloseTo(0.5 * Math.log(2) + 0.75, 15)
    expect(mu.cV).toBeCloseTo(0.5 * Math.log(2) + 0.5, 15) // c_V = ∬ + ½∫V (Saff & Totik 1997, ch. I, with Q = V/2)
    const R = Math.SQRT2
    // ∬ = ∫ h dμ with h itself from quadrature; x = R sin ψ
    const self = gl(psi => semicircleH(R, R * Math.sin(psi)) * (2 / Math.PI) * Math.cos(psi) ** 2, -Math.PI / 2, Math.PI / 2, 48)
    expect(Math.abs(self - (0.5 * Math.log(2) + 0.25))).toBeLessThan(1e-11)
    const intV = gl(psi => (R * Math.sin(psi)) ** 2 * (2 / Math.PI) * Math.cos(psi) ** 2, -Math.PI / 2, Math.PI / 2, 16)
    expect(Math.abs(self + intV - (0.5 * Math.log(2) + 0.75))).toBeLessThan(1e-11)
    // total mass of the density
    expect(Math.abs(ts(x => mu.density([x]), -R, R) - 1)).toBeLessThan(1e-13)
  })

  it('h^μ inside and outside the support matches quadrature; Euler–Lagrange holds (a = 2.5)', () => {
    const a = 2.5
    const mu = semicircleMeasure(a)
    const R = Math.sqrt(2 / a)
    for (const x of [0, 0.1, -0.5, 0.85, R * 0.999, R * 1.0001, 1.2, -2, 7]) {
      expect(Math.abs(mu.potential([x]) - semicircleH(R, x))).toBeLessThan(1e-11)
    }
    for (let k = 0; k <= 200; k++) {
      const x = -3 + (6 * k) / 200
      const el = mu.potential([x]) + (a * x * x) / 2 - mu.cV
      if (Math.abs(x) <= R) {
        expect(Math.abs(el)).toBeLessThan(1e-14)
        expect(mu.zeta([x])).toBe(0)
      }
      else {
        expect(mu.zeta([x])).toBeGreaterThan(0)
        expect(Math.abs(mu.zeta([x]) - el)).toBeLessThan(1e-13) // two independent formulas for ζ
      }
    }
    // I_V scales as ½ log(2a) + ¾ (R = √(2/a))
    expect(mu.IV).toBeCloseTo(0.5 * Math.log(2 * a) + 0.75, 14)
  })

  it('sphere averages are means over x ± η', () => {
    const mu = semicircleMeasure(1)
    for (const [x, eta] of [[0.2, 0.1], [1.3, 0.3], [-0.4, 2], [3, 0.5]]) {
      const expected = 0.5 * (semicircleH(Math.SQRT2, x - eta) + semicircleH(Math.SQRT2, x + eta))
      expect(Math.abs(mu.sphereAverage([x], 0, eta) - expected)).toBeLessThan(1e-11)
    }
  })
})

describe('semicircle law seen from the plane (d = 1 embedded in R²)', () => {
  it('circle averages of the planar potential match brute force over the circle', () => {
    // U(z) = −Re F(z), F(z) = ∫ log(z − y) dμ(y) = (z² − z w)/R² + log(z + w) − ½ − log 2, w = √(z − R)√(z + R)
    // (the analytic continuation of the exterior formula above; Saff & Totik 1997, ch. IV)
    const a = 1
    const R = Math.sqrt(2 / a)
    const csqrt = (re: number, im: number): [number, number] => {
      const m = Math.hypot(re, im)
      const sr = Math.sqrt((m + re) / 2)
      const si = Math.sign(im || 1) * Math.sqrt(Math.max(0, (m - re) / 2))
      return [sr, si]
    }
    const U = (zr: number, zi: number): number => {
      const [ar, ai] = csqrt(zr - R, zi)
      const [br, bi] = csqrt(zr + R, zi)
      const wr = ar * br - ai * bi
      const wi = ar * bi + ai * br
      const z2r = zr * zr - zi * zi
      const zwr = zr * wr - zi * wi
      return -((z2r - zwr) / (R * R) + Math.log(Math.hypot(zr + wr, zi + wi)) - 0.5 - Math.log(2))
    }
    // the planar formula restricted to the line is h^μ
    for (const x of [0.3, -1.2, 2]) expect(Math.abs(U(x, 1e-300) - semicircleMeasure(a).potential([x]))).toBeLessThan(1e-13)
    for (const [x, eta] of [[0, 0.3], [0.5, 1], [1.3, 0.2], [-1.4, 0.05], [2, 0.4], [0.2, 3], [1.6, 0.1]]) {
      const n = 1 << 15
      let s = 0
      for (let k = 0; k < n; k++) {
        const th = (2 * Math.PI * (k + 0.5)) / n
        s += U(x + eta * Math.cos(th), eta * Math.sin(th))
      }
      expect(Math.abs(semicirclePlanarCircleAverage(a, x, eta) - s / n)).toBeLessThan(1e-9)
    }
  })
})

// ——— d = 2: disk ———

describe('uniform disk (d = 2, log, V = a|x|²)', () => {
  it('a = 1: ∬ = ¼, I_V = ¾, c_V = ½ (Saff & Totik 1997; Forrester 2010), also by quadrature', () => {
    const mu = uniformDiskMeasure(1)
    expect(mu.selfEnergy).toBeCloseTo(0.25, 15)
    expect(mu.IV).toBeCloseTo(0.75, 15)
    expect(mu.cV).toBeCloseTo(0.5, 15)
    // Radial reduction by Newton's theorem: ∬ = ∫∫ −log max(r, t) dF(r) dF(t), dF = 2r dr on [0, 1]
    const self = 2 * ts(r => 2 * r * gl(t => -Math.log(r) * 2 * t, 0, r, 8), 0, 1)
    expect(Math.abs(self - 0.25)).toBeLessThan(1e-13)
    const intV = gl(r => r * r * 2 * r, 0, 1, 8)
    expect(Math.abs(self + intV - 0.75)).toBeLessThan(1e-13)
  })

  it('Newton\'s theorem used by the closed forms: the circle average of −log|z − y| is −log max(|y − x|, η)', () => {
    // trapezoid rule in the angle (exponentially accurate for these smooth periodic integrands)
    for (const [dist, eta] of [[0.3, 1], [2, 0.5], [1, 0.95]]) {
      const n = 4096
      let s = 0
      for (let k = 0; k < n; k++) {
        const th = (2 * Math.PI * (k + 0.5)) / n
        s += -0.5 * Math.log(dist * dist + eta * eta - 2 * dist * eta * Math.cos(th))
      }
      expect(Math.abs(s / n + Math.log(Math.max(dist, eta)))).toBeLessThan(1e-12)
    }
  })

  it('h^μ matches quadrature inside and outside; Euler–Lagrange holds (a = 3)', () => {
    const a = 3
    const mu = uniformDiskMeasure(a)
    const R = 1 / Math.sqrt(a)
    const hNum = (r: number): number => {
      const f = (t: number): number => (2 * t / (R * R)) * -Math.log(Math.max(r, t))
      if (r === 0) return ts(f, 0, R)
      return r < R ? gl(f, 0, r, 16) + gl(f, r, R, 16) : gl(f, 0, R, 16)
    }
    for (const r of [0, 0.1, 0.4, R, 0.9, 2.5]) expect(Math.abs(mu.potential(at(2, r)) - hNum(r))).toBeLessThan(1e-13)
    for (let k = 0; k <= 100; k++) {
      const x = Float64Array.from([-2 + 0.04 * k, 0.3 - 0.01 * k])
      const r2 = x[0] ** 2 + x[1] ** 2
      const el = mu.potential(x) + (a * r2) / 2 - mu.cV
      if (Math.sqrt(r2) <= R) {
        expect(Math.abs(el)).toBeLessThan(1e-14)
        expect(mu.zeta(x)).toBe(0)
      }
      else {
        expect(mu.zeta(x)).toBeGreaterThan(0)
        expect(Math.abs(mu.zeta(x) - el)).toBeLessThan(1e-13)
      }
    }
    expect(Math.abs(gl(r => mu.density(at(2, r)) * 2 * Math.PI * r, 0, R, 8) - 1)).toBeLessThan(1e-14)
  })

  it('circle averages (inside, crossing the edge, outside) match brute-force quadrature over the circle', () => {
    const a = 1
    const mu = uniformDiskMeasure(a)
    const cases: Array<[number, number]> = [
      [0.2, 0.3], [0, 0.5], [0, 2], [0.5, 0.5], [0.9, 0.2], [1.05, 0.1], [0.7, 1.2], [1.5, 1.4], [0.3, 1.31], [0.01, 1.0], [3, 0.5], [0.2, 4],
    ]
    for (const [rho, eta] of cases) {
      const x = at(2, rho)
      const n = 1 << 16
      let s = 0
      const z = new Float64Array(2)
      for (let k = 0; k < n; k++) {
        const th = (2 * Math.PI * (k + 0.5)) / n
        z[0] = x[0] + eta * Math.cos(th)
        z[1] = x[1] + eta * Math.sin(th)
        s += mu.potential(z)
      }
      expect(Math.abs(mu.sphereAverage(x, 0, eta) - s / n)).toBeLessThan(1e-11)
    }
    // inside the support: h − ⟨h⟩ = c_d m η²/(2d) = aη²/2 (h is quadratic there: elementary)
    expect(mu.potential(at(2, 0.3)) - mu.sphereAverage(at(2, 0.3), 0, 0.4)).toBeCloseTo(0.08, 15)
    expect(diskCircleAverage(1, 0.5, 0)).toBeCloseTo(mu.potential(at(2, 0.5)), 15)
  })
})

// ——— d = 3: ball ———

describe('uniform ball (d = 3, coulomb, V = a|x|²)', () => {
  it('a = 1: ∬ = 6/5, I_V = 9/5, c_V = 3/2 (Landkof 1972), also by quadrature', () => {
    const mu = uniformBallMeasure(1)
    expect(mu.selfEnergy).toBeCloseTo(1.2, 15)
    expect(mu.IV).toBeCloseTo(1.8, 15)
    expect(mu.cV).toBeCloseTo(1.5, 15)
    // ∬ = ∫∫ 1/max(r, t) dF(r) dF(t), dF = 3r² dr (Newton's theorem)
    const self = 2 * gl(r => 3 * r * r * gl(t => (3 * t * t) / r, 0, r, 8), 0, 1, 16)
    expect(Math.abs(self - 1.2)).toBeLessThan(1e-14)
    expect(Math.abs(self + gl(r => r * r * 3 * r * r, 0, 1, 8) - 1.8)).toBeLessThan(1e-14)
  })

  it('Euler–Lagrange holds and ζ ≥ 0 outside (a = 0.5)', () => {
    const a = 0.5
    const mu = uniformBallMeasure(a)
    const R = Math.cbrt(1 / a)
    for (let k = 0; k <= 100; k++) {
      const r = 0.03 * k
      const x = at(3, r)
      const el = mu.potential(x) + (a * r * r) / 2 - mu.cV
      if (r <= R) expect(Math.abs(el)).toBeLessThan(1e-14)
      else {
        expect(mu.zeta(x)).toBeGreaterThan(0)
        expect(Math.abs(mu.zeta(x) - el)).toBeLessThan(1e-14)
      }
    }
    expect(Math.abs(gl(r => mu.density(at(3, r)) * 4 * Math.PI * r * r, 0, R, 8) - 1)).toBeLessThan(1e-14)
  })

  it('sphere averages match brute-force quadrature over the sphere', () => {
    const mu = uniformBallMeasure(1)
    const cases: Array<[number, number]> = [[0.2, 0.3], [0.9, 0.3], [0.5, 0.8], [1.2, 0.5], [0.1, 1.05], [0.3, 2], [2.5, 1], [0, 1.5]]
    // product rule over the sphere: polar angle in 2000 composite GL panels (the kink at |z| = R is C¹), 12 azimuths
    for (const [rho, eta] of cases) {
      const x = at(3, rho)
      const z = new Float64Array(3)
      const e1 = [0.6, -0.8, 0]
      const e2 = [0.48, 0.36, -0.8]
      const e3 = [0.64, 0.48, 0.6]
      let s = 0
      const M = 12
      for (let m = 0; m < M; m++) {
        const phi = (2 * Math.PI * m) / M
        s += glc((t) => {
          const st = Math.sqrt(1 - t * t)
          for (let k = 0; k < 3; k++) z[k] = x[k] + eta * (t * e3[k] + st * (Math.cos(phi) * e1[k] + Math.sin(phi) * e2[k]))
          return mu.potential(z) / 2
        }, -1, 1, 2000, 4)
      }
      expect(Math.abs(mu.sphereAverage(x, 0, eta) - s / M)).toBeLessThan(1e-10)
    }
    expect(mu.potential(at(3, 0.4)) - ballSphereAverage(1, 0.4, 0.5)).toBeCloseTo(0.125, 15) // aη²/2 (h is quadratic in the ball: elementary)
  })
})

// ——— Riesz ———

/** Sphere average over |y| = r of |x − y|^(−s), |x| = ρ, in d = 1, 2, 3; `gap` = |ρ − r| is passed exactly. */
function rieszShell(d: number, s: number, rho: number, r: number, gap: number): number {
  if (d === 1) return 0.5 * (gap ** -s + (rho + r) ** -s)
  if (d === 3) return ((rho + r) ** (2 - s) - gap ** (2 - s)) / (2 * (2 - s) * rho * r)
  // d = 2 is used with s = 1 only: (1/π)∫_0^π (ρ² + r² − 2ρr cos θ)^(−1/2) dθ = 2K(k)/(π(ρ + r)), k² = 4ρr/(ρ + r)²
  if (s !== 1) throw new Error('test helper: d = 2 shell average only for s = 1')
  return (2 * ellipticK(gap / (rho + r))) / (Math.PI * (rho + r))
}

/** h(x) = ∫ |x − y|^(−s) dμ(y) by radial quadrature, with the singular shell r = ρ placed at an endpoint 0. */
function rieszHNum(mu: EquilibriumMeasure, d: number, s: number, R: number, rho: number): number {
  const area = d === 1 ? 2 : d === 2 ? 2 * Math.PI : 4 * Math.PI
  const radial = (r: number): number => mu.density(at(d, r)) * area * r ** (d - 1)
  if (rho === 0) return ts(r => radial(r) * r ** -s, 0, R)
  if (rho < R) {
    return ts(v => radial(rho - v) * rieszShell(d, s, rho, rho - v, v), 0, rho)
      + ts(v => radial(rho + v) * rieszShell(d, s, rho, rho + v, v), 0, R - rho)
  }
  return ts(r => radial(r) * rieszShell(d, s, rho, r, rho - r), 0, R)
}

describe('Riesz equilibrium measures (V = a|x|², d − 2 < s < d)', () => {
  const settings: Array<{ d: 1 | 2 | 3, s: number, a: number, tol: number }> = [
    { d: 1, s: 0.5, a: 1, tol: 1e-10 },
    { d: 2, s: 1, a: 1, tol: 1e-9 },
    { d: 3, s: 1.5, a: 2, tol: 1e-10 },
    { d: 3, s: 2.5, a: 1, tol: 1e-10 },
  ]
  for (const { d, s, a, tol } of settings) {
    it(`d = ${d}, s = ${s}, a = ${a}: mass, c_V, ∬, h^μ inside and outside by quadrature (Chafaï, Saff & Womersley 2022)`, () => {
      const mu = rieszBallMeasure(d, s, a)
      const R = (mu.support as { radius: number }).radius
      const area = d === 1 ? 2 : d === 2 ? 2 * Math.PI : 4 * Math.PI
      const mass = ts(r => mu.density(at(d, r)) * area * r ** (d - 1), 0, R)
      expect(Math.abs(mass - 1)).toBeLessThan(1e-13)
      // c_V = h(0) (V(0) = 0)
      expect(Math.abs(rieszHNum(mu, d, s, R, 0) - mu.cV)).toBeLessThan(tol)
      // ∬ = ∫ h dμ with h = c_V − a|x|²/2 on the support: c_V − (a/2)∫|x|² dμ; I_V = ∬ + ∫V
      const m2 = ts(r => r * r * mu.density(at(d, r)) * area * r ** (d - 1), 0, R)
      expect(Math.abs(mu.selfEnergy - (mu.cV - (a / 2) * m2))).toBeLessThan(1e-13)
      expect(Math.abs(mu.IV - (mu.selfEnergy + a * m2))).toBeLessThan(1e-13)
      for (const f of [0.3, 0.8, 1.02, 1.5, 3]) {
        const rho = f * R
        expect(Math.abs(mu.potential(at(d, rho)) - rieszHNum(mu, d, s, R, rho))).toBeLessThan(tol * Math.max(1, mu.cV))
      }
      // Euler–Lagrange: equality on the support, ζ ≥ 0 outside, continuity at the edge
      for (let k = 0; k <= 60; k++) {
        const rho = (k / 30) * R
        const el = mu.potential(at(d, rho)) + (a * rho * rho) / 2 - mu.cV
        if (rho <= R) expect(Math.abs(el)).toBeLessThan(1e-13)
        else expect(el).toBeGreaterThan(-1e-12)
        expect(mu.zeta(at(d, rho))).toBeGreaterThanOrEqual(0)
      }
      expect(Math.abs(mu.potential(at(d, R * (1 + 1e-9))) - (mu.cV - (a * R * R) / 2))).toBeLessThan(1e-7)
    })
  }

  it('sphere averages crossing the edge match brute-force quadrature', () => {
    for (const { d, s } of [{ d: 2 as const, s: 1 }, { d: 3 as const, s: 1.5 }]) {
      const mu = rieszBallMeasure(d, s, 1)
      const R = (mu.support as { radius: number }).radius
      for (const [f, g] of [[0.8, 0.5], [1.2, 0.4], [0.1, 1.5], [2, 0.3]]) {
        const x = at(d, f * R)
        const eta = g * R
        let brute: number
        if (d === 2) {
          const n = 1 << 13
          let sum = 0
          for (let k = 0; k < n; k++) {
            const th = (2 * Math.PI * (k + 0.5)) / n
            sum += mu.potential([x[0] + eta * Math.cos(th), x[1] + eta * Math.sin(th)])
          }
          brute = sum / n
        }
        else {
          // Archimedes: the axial coordinate t is uniform on [−1, 1]
          const rho = f * R
          brute = glc(t => mu.potential(at(3, Math.sqrt(Math.max(0, rho * rho + eta * eta + 2 * rho * eta * t)))) / 2, -1, 1, 400, 8)
        }
        expect(Math.abs(mu.sphereAverage(x, 0, eta) - brute)).toBeLessThan(1e-8)
      }
    }
  })

  it('reduces to the uniform ball at s = d − 2 = 1 in d = 3', () => {
    const mu = rieszBallMeasure(3, 1 + 1e-7, 1)
    expect(Math.abs(mu.IV - 1.8)).toBeLessThan(1e-6)
    expect(Math.abs(mu.selfEnergy - 1.2)).toBeLessThan(1e-6)
    expect(() => rieszBallMeasure(2, 2, 1)).toThrow(EngineInputError)
  })
})

// ——— sphere ———

describe('uniform measure on S²', () => {
  it('∫|x − y|^(−s) dσ = 2^(1−s)/(2−s), ∫ −log|x − y| dσ = ½ − log 2 (Brauchart, Hardin & Saff 2012), by quadrature', () => {
    // Archimedes: for uniform y on S², t = x·y is uniform on [−1, 1] and |x − y|² = 2 − 2t
    for (const s of [0.5, 1, 1.5]) {
      const mu = sphereUniformMeasure({ name: 'riesz', s })
      const q = ts(w => (4 * w ** 4) ** (-s / 2) * 4 * w ** 3, 0, 1) // u = 1 − t = 2w⁴
      expect(Math.abs(mu.potential([0, 0, 1]) - q)).toBeLessThan(1e-12)
      expect(mu.potential([0, 0, 1])).toBeCloseTo(2 ** (1 - s) / (2 - s), 14)
      expect(mu.IV).toBe(mu.selfEnergy)
    }
    const log = sphereUniformMeasure({ name: 'log' })
    expect(Math.abs(log.potential([0.6, 0, 0.8]) - ts(u => -0.5 * Math.log(2 * u) / 2, 0, 2))).toBeLessThan(1e-13)
    expect(log.selfEnergy).toBeCloseTo(0.5 - Math.log(2), 15)
    expect(sphereUniformMeasure({ name: 'coulomb' }).cV).toBe(1) // Newton: potential 1 on the unit sphere
    expect(() => sphereUniformMeasure({ name: 'riesz', s: 2 })).toThrow(/0 < s < 2/)
    expect(() => log.potential([0, 0, 2])).toThrow(/S² only/)
  })
})

// ——— choosing a measure ———

describe('equilibriumMeasure', () => {
  it('picks the closed form from the quadratic preset and scale a', () => {
    expect(equilibriumMeasure({ d: 1, kernel: { name: 'log' }, potential: quadratic(1, 1), geometry: { kind: 'free', d: 1 } }).IV).toBeCloseTo(0.5 * Math.log(2) + 0.75, 15)
    expect(equilibriumMeasure({ d: 2, kernel: { name: 'log' }, potential: quadratic(1, 2), geometry: { kind: 'free', d: 2 } }).IV).toBeCloseTo(0.75, 15)
    expect(equilibriumMeasure({ d: 3, kernel: { name: 'coulomb' }, potential: quadratic(1, 3), geometry: { kind: 'free', d: 3 } }).IV).toBeCloseTo(1.8, 15)
    expect(equilibriumMeasure({ d: 2, kernel: { name: 'log' }, potential: quadratic(4, 2), geometry: { kind: 'free', d: 2 } }).support).toEqual({ kind: 'ball', center: [0, 0], radius: 0.5 })
    expect(equilibriumMeasure({ d: 3, kernel: { name: 'log' }, geometry: { kind: 'sphere' } }).cV).toBeCloseTo(0.5 - Math.log(2), 15)
  })

  it('consults registered numerical solvers, else says a numerical solver is needed', () => {
    const quartic: Potential = { ...quadratic(1, 1), text: 'r^4', preset: { name: 'quartic', a: 0, b: 1 } }
    const request = { d: 1, kernel: { name: 'log' } as const, potential: quartic, geometry: { kind: 'free', d: 1 } as const }
    expect(() => equilibriumMeasure(request)).toThrow(/numerical solver needed/)
    const fake = semicircleMeasure(1)
    const unregister = registerNumericalSolver(req => (req.potential?.text === 'r^4' ? fake : undefined))
    expect(equilibriumMeasure(request)).toBe(fake)
    unregister()
    expect(() => equilibriumMeasure(request)).toThrow(EngineInputError)
    expect(() => equilibriumMeasure({ ...request, potential: quadratic(1, 2) })).toThrow(/dimension 2/)
  })
})
