// The splitting identity H_N = N² I_V + 2N Σ ζ(x_i) + F_N(X_N, μ_V) (Sandier & Serfaty,
// Ann. Probab. 43 (2015)) on seeded
// random configurations, with points inside and outside the support, and F_N against its definition.
import { describe, it, expect } from 'vitest'
import { nextOrderEnergy } from '../../shared/physics/nextorder'
import { energy, pairSumNaive } from '../../shared/physics/energy'
import type { Configuration, Geometry, Kernel } from '../../shared/physics/types'
import { quadraticPotential } from '../../shared/physics/potentials/presets'

// Tiny LCG for test inputs only (common practice).
function lcg(seed: number): () => number {
  let s = seed >>> 0
  return () => {
    s = (Math.imul(s, 1664525) + 1013904223) >>> 0
    return s / 4294967296
  }
}

// The engine's quadratic preset V = a|x|² (its own tests are in tests/unit/physics/potentials.test.ts).
const quadratic = quadraticPotential

/** N points uniform in the cube [−L, L]^d (many fall outside the support when L exceeds its radius). */
function cube(N: number, d: number, L: number, seed: number): Configuration {
  const rand = lcg(seed)
  const points = new Float64Array(N * d)
  for (let k = 0; k < points.length; k++) points[k] = L * (2 * rand() - 1)
  return { N, d, points }
}

const settings: Array<{ name: string, kernel: Kernel, geometry: Geometry, d: number, a: number, L: number }> = [
  { name: 'd = 1 log (semicircle)', kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, d: 1, a: 1, L: 2 },
  { name: 'd = 1 log, a = 3', kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, d: 1, a: 3, L: 1.5 },
  { name: 'd = 2 log (disk)', kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, d: 2, a: 1, L: 1.3 },
  { name: 'd = 3 coulomb (ball)', kernel: { name: 'coulomb' }, geometry: { kind: 'free', d: 3 }, d: 3, a: 1, L: 1.2 },
  { name: 'd = 2 riesz s = 1', kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'free', d: 2 }, d: 2, a: 1, L: 1.5 },
  { name: 'd = 3 riesz s = 2', kernel: { name: 'riesz', s: 2 }, geometry: { kind: 'free', d: 3 }, d: 3, a: 1, L: 1.5 },
]

describe('splitting identity', () => {
  for (const [k, st] of settings.entries()) {
    it(`${st.name}: residual ≤ 1e−10 relative on random configurations`, () => {
      const V = quadratic(st.a, st.d)
      for (const [trial, N] of [20, 150, 400].entries()) {
        const conf = cube(N, st.d, st.L, 1000 * k + trial)
        const res = nextOrderEnergy(conf, { kernel: st.kernel, geometry: st.geometry, potential: V })
        expect(res.splittingResidual.relative).toBeLessThanOrEqual(1e-10)
        // H from the energy module, independently of the splitting
        const H = energy(conf, { kernel: st.kernel, geometry: st.geometry, potential: V }).H
        const rhs = N * N * res.IV + 2 * N * res.zetaSum + res.nextOrder
        expect(Math.abs(H - rhs)).toBeLessThanOrEqual(1e-10 * (Math.abs(H) + Math.abs(N * N * res.IV) + Math.abs(res.nextOrder)))
        // some points lie outside the support, so ζ contributes
        expect(res.zetaSum).toBeGreaterThan(0)
      }
    })
  }

  it('holds on the sphere (V = 0, ζ = 0) for log and s = 1', () => {
    const rand = lcg(4)
    const N = 200
    const points = new Float64Array(3 * N)
    for (let i = 0; i < N; i++) {
      const z = 2 * rand() - 1
      const phi = 2 * Math.PI * rand()
      const r = Math.sqrt(1 - z * z)
      points.set([r * Math.cos(phi), r * Math.sin(phi), z], 3 * i)
    }
    for (const kernel of [{ name: 'log' }, { name: 'riesz', s: 1 }] as Kernel[]) {
      const res = nextOrderEnergy({ N, d: 3, points }, { kernel, geometry: { kind: 'sphere' } })
      expect(res.zetaSum).toBe(0)
      expect(res.splittingResidual.relative).toBeLessThanOrEqual(1e-10)
      // F_N = Σ_{i≠j} g − N² ∬ (h constant = ∬ on S²)
      const F = 2 * pairSumNaive({ N, d: 3, points }, kernel, { kind: 'sphere' }) - N * N * res.selfEnergy
      expect(Math.abs(res.nextOrder - F)).toBeLessThanOrEqual(1e-9 * Math.abs(F))
    }
  })

  it('F_N equals its definition Σ_{i≠j} g − 2N Σ h^μ(x_i) + N² ∬ g dμ dμ, with h^μ written out by hand (disk)', () => {
    const conf = cube(120, 2, 1.4, 99)
    const N = conf.N
    const res = nextOrderEnergy(conf, { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential: quadratic(1, 2) })
    let hSum = 0
    for (let i = 0; i < N; i++) {
      const r2 = conf.points[2 * i] ** 2 + conf.points[2 * i + 1] ** 2
      hSum += r2 <= 1 ? (1 - r2) / 2 : -0.5 * Math.log(r2) // uniform disk, a = 1 (Saff & Totik 1997, ch. IV)
    }
    const F = 2 * pairSumNaive(conf, { name: 'log' }, { kind: 'free', d: 2 }) - 2 * N * hSum + N * N * 0.25
    expect(Math.abs(res.nextOrder - F)).toBeLessThanOrEqual(1e-10 * (Math.abs(F) + N * N))
  })
})
