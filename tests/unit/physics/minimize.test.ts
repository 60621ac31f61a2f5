import { describe, it, expect } from 'vitest'
import { lbfgs } from '../../../shared/physics/minimize/lbfgs'
import { groundState } from '../../../shared/physics/minimize/ground-state'
import { createRng } from '../../../shared/physics/random'
import { quadraticPotential } from '../../../shared/physics/potentials/presets'
import { torusEnergy } from '../../../shared/physics/torus/ewald'
import { cubicLattice } from '../../../shared/physics/torus/lattice'
import { energyAndGradient, radialKernel } from '../../../shared/physics/samplers/forces'
import { ENGINE_VERSION } from '../../../shared/physics/version'

describe('L-BFGS (Nocedal & Wright 2006, Alg. 7.4/7.5 with a strong-Wolfe line search)', () => {
  it('minimises the Rosenbrock function to its minimum at (1, 1) (Rosenbrock, Comput. J. 3, 1960)', () => {
    const res = lbfgs((x, g) => {
      const a = 1 - x[0]
      const b = x[1] - x[0] * x[0]
      g[0] = -2 * a - 400 * x[0] * b
      g[1] = 200 * b
      return a * a + 100 * b * b
    }, new Float64Array([-1.2, 1]))
    expect(res.converged).toBe(true)
    expect(res.x[0]).toBeCloseTo(1, 8)
    expect(res.x[1]).toBeCloseTo(1, 8)
    expect(res.f).toBeLessThan(1e-16)
  })

  it('minimises an ill-conditioned quadratic Σ k x_k² in few iterations', () => {
    const n = 50
    const x0 = Float64Array.from({ length: n }, (_, k) => Math.cos(k))
    const res = lbfgs((x, g) => {
      let f = 0
      for (let k = 0; k < n; k++) {
        f += (k + 1) * x[k] * x[k]
        g[k] = 2 * (k + 1) * x[k]
      }
      return f
    }, x0, { gradientTolerance: 1e-12 })
    expect(res.reason).toBe('gradient')
    expect(res.gradientNorm).toBeLessThanOrEqual(1e-12)
    expect(res.iterations).toBeLessThan(200)
  })

  it('backs off where the objective is undefined (log barrier)', () => {
    // f(x) = x − log x on x > 0, minimum at x = 1; NaN outside
    const res = lbfgs((x, g) => {
      if (!(x[0] > 0)) return NaN
      g[0] = 1 - 1 / x[0]
      return x[0] - Math.log(x[0])
    }, new Float64Array([5]), { maxStepLength: 100 })
    expect(res.x[0]).toBeCloseTo(1, 8)
  })
})

describe('energy gradients', () => {
  it('the analytic ∇H matches central differences of H (log in 2-D with V = |x|², riesz on R³)', () => {
    const rng = createRng('grad')
    for (const [kernel, d] of [[{ name: 'log' as const }, 2], [{ name: 'riesz' as const, s: 0.7 }, 3]] as const) {
      const N = 6
      const x = Float64Array.from({ length: N * d }, () => rng.normal())
      const rk = radialKernel(kernel, d)
      const V = quadraticPotential(1, d)
      const g = new Float64Array(N * d)
      energyAndGradient(x, N, d, rk, V, g)
      const tmp = new Float64Array(N * d)
      for (let k = 0; k < N * d; k++) {
        const h = 1e-6
        const xp = Float64Array.from(x)
        xp[k] += h
        const xm = Float64Array.from(x)
        xm[k] -= h
        const fd = (energyAndGradient(xp, N, d, rk, V, tmp) - energyAndGradient(xm, N, d, rk, V, tmp)) / (2 * h)
        expect(Math.abs(fd - g[k])).toBeLessThan(1e-6 * Math.max(1, Math.abs(g[k])))
      }
    }
  })
})

describe('ground states', () => {
  it('reports the best energy in the canonical convention, the spread and the engine version', () => {
    const r = groundState({ N: 5, kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadraticPotential(1, 2), restarts: 4 }, createRng(1))
    expect(r.engineVersion).toBe(ENGINE_VERSION)
    expect(r.runs.length).toBe(4)
    expect(r.spread.min).toBe(r.energy)
    expect(r.spread.max).toBeGreaterThanOrEqual(r.spread.min)
    expect(r.spread.distinct.reduce((s, x) => s + x.count, 0)).toBe(4)
    // N = 5 with V = |x|² and the log kernel: the regular pentagon; at the minimum Σ_{j≠i} 1/|x_i−x_j|²·(x_i−x_j) = N x_i
    // gives |x|² = (N − 1)/(2N) for points on a circle centred at 0 (Σ_{j≠i} (x_i − x_j)·x_i/|x_i−x_j|² = (N−1)/2)
    for (let i = 0; i < 5; i++) expect(Math.hypot(r.best.points[2 * i], r.best.points[2 * i + 1]) ** 2).toBeCloseTo(4 / 10, 7)
  })

  it('torus: two points settle at half a diagonal apart, and H_T comes from the Ewald sum', () => {
    const L = 1
    const r = groundState({ N: 2, kernel: { name: 'log' }, geometry: { kind: 'torus', d: 2, L }, restarts: 2 }, createRng(4))
    const dx = Math.abs(r.best.points[0] - r.best.points[2])
    const dy = Math.abs(r.best.points[1] - r.best.points[3])
    // by the symmetries of the square, G is smallest at (L/2, L/2) (the point farthest from all images)
    expect(Math.min(dx, L - dx)).toBeCloseTo(0.5, 4)
    expect(Math.min(dy, L - dy)).toBeCloseTo(0.5, 4)
    expect(r.energy).toBeCloseTo(torusEnergy(cubicLattice(2, L), [0, 0, 0.5, 0.5]).value, 8)
    expect(r.parametrisation).toBe('torus-wrapped')
  })

  it('refuses a free-space problem without a potential and a sphere with one', () => {
    expect(() => groundState({ N: 3, kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 } }, createRng(1))).toThrow(/confining/)
    expect(() => groundState({ N: 3, kernel: { name: 'log' }, geometry: { kind: 'sphere' }, potential: quadraticPotential(1, 3) }, createRng(1))).toThrow(/no external potential/)
    expect(() => groundState({ N: 1, kernel: { name: 'log' }, geometry: { kind: 'sphere' } }, createRng(1))).toThrow(/N ≥ 2/)
  })
})
