import { describe, it, expect } from 'vitest'
import { smearedPairEnergy, smearedPotential, smearedSelfEnergy } from '../../../shared/physics/smeared'
import { integrateAdaptive as integrate } from '../../../shared/physics/quadrature'
import {
  electricEnergy,
  electricGap,
  lineAverageDefect,
  nearestNeighbourDistances,
  overlappingPairs,
  smearingRadii,
} from '../../../shared/physics/electric'
import { EngineInputError } from '../../../shared/physics/errors'
import { ENGINE_VERSION } from '../../../shared/physics/version'
import type { Configuration } from '../../../shared/physics/types'
import {
  compositeGL,
  nextOrderEnergy,
  pointsInBall,
  seeded,
  semicircle,
  uniformBall,
  uniformDisk,
} from '../../support/uniform-measures'

const conf = (points: Float64Array, d: number): Configuration => ({ N: points.length / d, d, points })
const FINE = { relTol: 1e-14, absTol: 1e-300 }
const rel = (a: number, b: number): number => Math.abs(a - b) / Math.max(1e-300, Math.abs(b))

describe('smeared charges: Newton’s theorem (Lieb & Loss, Analysis, 2nd ed. 2001, Thm 9.7)', () => {
  const c = [0.2, -0.1, 0.05]
  it('2-D: −log max(|x − c|, η) equals the circle average of −log|x − y| (brute-force quadrature)', () => {
    const eta = 0.3
    for (const r of [0, 0.1, 0.27, 0.33, 0.45, 1.7]) {
      const x = [c[0] + r * Math.cos(0.7), c[1] + r * Math.sin(0.7)]
      const f = (t: number): number => -0.5 * Math.log((x[0] - c[0] - eta * Math.cos(t)) ** 2 + (x[1] - c[1] - eta * Math.sin(t)) ** 2)
      const brute = compositeGL(f, 0, 2 * Math.PI, 256) / (2 * Math.PI)
      expect(Math.abs(smearedPotential(2, r, eta) - brute)).toBeLessThan(1e-9)
    }
  })
  it('3-D: 1/max(|x − c|, η) equals the sphere average of 1/|x − y| (product quadrature in θ, φ)', () => {
    const eta = 0.25
    for (const r of [0, 0.1, 0.2, 0.3, 0.6, 2]) {
      const dir = [0.36, 0.48, 0.8] // a unit vector off the axes
      const x = dir.map((v, k) => c[k] + r * v)
      const inner = (th: number): number => compositeGL((ph) => {
        const y = [c[0] + eta * Math.sin(th) * Math.cos(ph), c[1] + eta * Math.sin(th) * Math.sin(ph), c[2] + eta * Math.cos(th)]
        return 1 / Math.hypot(x[0] - y[0], x[1] - y[1], x[2] - y[2])
      }, 0, 2 * Math.PI, 24)
      const brute = compositeGL(th => inner(th) * Math.sin(th), 0, Math.PI, 24) / (4 * Math.PI)
      expect(rel(smearedPotential(3, r, eta), brute)).toBeLessThan(1e-8)
    }
  })
})

describe('smeared pair interaction', () => {
  // independent evaluation: average of Newton's potential of δ^{(a)} over the other sphere,
  // adaptive quadrature over the angle with breakpoints where |y − c| = a
  const brute = (d: 2 | 3, D: number, a: number, b: number): number => {
    const cosCross = (a * a - D * D - b * b) / (2 * b * D)
    const pts = [0, Math.PI]
    if (D > 0 && cosCross > -1 && cosCross < 1) pts.splice(1, 0, Math.acos(cosCross))
    const r = (t: number): number => Math.sqrt(Math.max(0, D * D + b * b + 2 * b * D * Math.cos(t)))
    let s = 0
    for (let k = 0; k + 1 < pts.length; k++) {
      const f = d === 2 ? (t: number) => smearedPotential(2, r(t), a) / Math.PI : (t: number) => (smearedPotential(3, r(t), a) * Math.sin(t)) / 2
      s += integrate(f, pts[k], pts[k + 1], { relTol: 1e-15, absTol: 1e-300 }).value
    }
    return s
  }
  const cases: Array<[number, number, number]> = [
    [0.3, 0.2, 0.25], [0.25, 0.25, 0.25], [0.01, 0.3, 0.3], [1e-7, 0.3, 0.3], [0.45, 0.2, 0.25],
    [0.1, 0.5, 0.05], [0.5, 0.3, 0.2], [1.2, 0.3, 0.4], [0.05, 0.02, 0.3], [0.3, 0.3, 0.3],
  ]
  it('agrees with brute-force angular quadrature in 2-D and 3-D (1e-12)', () => {
    for (const [D, a, b] of cases) {
      for (const d of [2, 3] as const) {
        const v = smearedPairEnergy(d, D, a, b)
        expect(Math.abs(v - brute(d, D, a, b))).toBeLessThan(1e-12 * Math.max(1, Math.abs(v)))
      }
    }
  })
  it('is symmetric in the two radii', () => {
    for (const [D, a, b] of cases) {
      for (const d of [2, 3] as const) expect(Math.abs(smearedPairEnergy(d, D, a, b) - smearedPairEnergy(d, D, b, a))).toBeLessThan(1e-13)
    }
  })
  it('self-interaction at distance 0 with equal radii is g(η), also by a direct double average', () => {
    for (const eta of [0.01, 0.3, 2]) {
      expect(smearedPairEnergy(2, 0, eta, eta)).toBe(smearedSelfEnergy(2, eta))
      expect(smearedPairEnergy(3, 0, eta, eta)).toBe(smearedSelfEnergy(3, eta))
      // by rotation invariance ∬ −log|y − y′| = (1/2π)∫ −log(2η sin(ψ/2)) dψ and ∬ 1/|y − y′| = ½∫ sin θ/(2η sin(θ/2)) dθ
      const two = integrate(p => -Math.log(2 * eta * Math.sin(p / 2)), 0, 2 * Math.PI, FINE).value / (2 * Math.PI)
      const three = integrate(t => Math.sin(t) / (4 * eta * Math.sin(t / 2)), 0, Math.PI, FINE).value
      expect(Math.abs(two - -Math.log(eta))).toBeLessThan(1e-11)
      expect(rel(three, 1 / eta)).toBeLessThan(1e-13)
    }
  })
  it('equals g(D) for disjoint balls and is strictly smaller when they overlap (mean-value property of superharmonic g; Lieb & Loss 2001, ch. 9)', () => {
    const rand = seeded(11)
    for (let k = 0; k < 400; k++) {
      const a = 0.01 + rand()
      const b = 0.01 + rand()
      const D = 2.5 * rand()
      for (const d of [2, 3] as const) {
        const g = d === 2 ? -Math.log(D) : 1 / D
        const v = smearedPairEnergy(d, D, a, b)
        if (D >= a + b) expect(v).toBe(g)
        else expect(v).toBeLessThan(g)
      }
    }
  })
  it('is continuous where the balls start to overlap and where one sphere enters the other ball', () => {
    for (const d of [2, 3] as const) {
      const [a, b] = [0.3, 0.2]
      expect(Math.abs(smearedPairEnergy(d, a + b - 1e-9, a, b) - smearedPairEnergy(d, a + b, a, b))).toBeLessThan(1e-7)
      expect(Math.abs(smearedPairEnergy(d, a - b - 1e-9, a, b) - smearedPairEnergy(d, a - b + 1e-9, a, b))).toBeLessThan(1e-7)
    }
  })
  it('rejects non-positive radii', () => {
    expect(() => smearedPairEnergy(2, 0.1, 0, 0.2)).toThrow(RangeError)
  })
})

describe('cell lists', () => {
  const bruteNN = (p: Float64Array, d: number): Float64Array => {
    const N = p.length / d
    const out = new Float64Array(N).fill(Infinity)
    for (let i = 0; i < N; i++) {
      for (let j = 0; j < N; j++) {
        if (i === j) continue
        let s = 0
        for (let c = 0; c < d; c++) s += (p[i * d + c] - p[j * d + c]) ** 2
        out[i] = Math.min(out[i], Math.sqrt(s))
      }
    }
    return out
  }
  it('nearest-neighbour distances match the O(N²) search in d = 1, 2, 3, also for clustered points', () => {
    const rand = seeded(5)
    for (const d of [1, 2, 3]) {
      const p = pointsInBall(700, d, 1, rand)
      for (let i = 0; i < 100 * d; i++) p[i] *= 1e-3 // a dense cluster
      const fast = nearestNeighbourDistances(p, d)
      const slow = bruteNN(p, d)
      for (let i = 0; i < fast.length; i++) expect(fast[i]).toBe(slow[i])
    }
  })
  it('overlapping pairs match the O(N²) search', () => {
    const rand = seeded(6)
    for (const d of [1, 2, 3]) {
      const p = pointsInBall(400, d, 1, rand)
      const etas = Float64Array.from({ length: 400 }, () => 0.05 * rand())
      const got = new Set<string>()
      const pairs = overlappingPairs(p, d, etas)
      for (let k = 0; k < pairs.length; k += 2) got.add(`${pairs[k]},${pairs[k + 1]}`)
      let count = 0
      for (let i = 0; i < 400; i++) {
        for (let j = i + 1; j < 400; j++) {
          let s = 0
          for (let c = 0; c < d; c++) s += (p[i * d + c] - p[j * d + c]) ** 2
          if (Math.sqrt(s) < etas[i] + etas[j]) {
            count++
            expect(got.has(`${i},${j}`)).toBe(true)
          }
        }
      }
      expect(count).toBeGreaterThan(0)
      expect(got.size).toBe(count)
    }
  })
})

describe('smearing rules', () => {
  it('fixed, scaled and nearest-neighbour-capped radii', () => {
    const p = Float64Array.from([0, 0, 0.1, 0, 3, 0, 3, 2])
    const c = conf(p, 2)
    expect(Array.from(smearingRadii(c, { kind: 'fixed', eta: 0.2 }))).toEqual([0.2, 0.2, 0.2, 0.2])
    expect(Array.from(smearingRadii(c, { kind: 'scaled', factor: 3 }))).toEqual([1.5, 1.5, 1.5, 1.5])
    const nn = smearingRadii(c, { kind: 'nn-capped' })
    expect(nn[0]).toBeCloseTo(0.025, 15)
    expect(nn[1]).toBeCloseTo(0.025, 15)
    expect(nn[2]).toBe(0.5) // min(¼·2, 4^(−1/2))
    expect(nn[3]).toBe(0.5)
  })
})

describe('electric energy and the lower bound for F_N', () => {
  const setups = [
    { d: 1, measure: semicircle(), radius: 1.3 },
    { d: 2, measure: uniformDisk(1), radius: 0.95 },
    { d: 3, measure: uniformBall(1), radius: 0.95 },
  ]
  it('F_N equals the lower bound (1e-10 relative) when all balls are disjoint (nn-capped rule), d = 1, 2, 3', () => {
    const rand = seeded(21)
    for (const { d, measure, radius } of setups) {
      for (const N of [2, 7, 40]) {
        const p = pointsInBall(N, d, radius, rand)
        const res = electricEnergy(conf(p, d), measure, { rule: { kind: 'nn-capped' } })
        const FN = nextOrderEnergy(p, d, measure)
        expect(res.overlaps).toBe(0)
        expect(Math.abs(electricGap(FN, res))).toBeLessThan(1e-10 * Math.max(1, Math.abs(FN)))
        expect(res.value).toBeGreaterThan(res.lowerBound) // Σ g(η_i) + background defects > 0 here
        expect(res.engineVersion).toBe(ENGINE_VERSION)
      }
    }
  })
  it('F_N exceeds the lower bound strictly when balls overlap, by Σ over overlapping pairs of g − smeared interaction', () => {
    const rand = seeded(22)
    for (const { d, measure, radius } of setups) {
      const p = pointsInBall(12, d, radius, rand)
      const res = electricEnergy(conf(p, d), measure, { rule: { kind: 'fixed', eta: 0.4 } })
      const FN = nextOrderEnergy(p, d, measure)
      expect(res.overlaps).toBeGreaterThan(0)
      const gap = electricGap(FN, res)
      expect(gap).toBeGreaterThan(1e-3)
      let expected = 0
      const pd = d === 3 ? 3 : 2
      for (let i = 0; i < 12; i++) {
        for (let j = 0; j < 12; j++) {
          if (i === j) continue
          let s = 0
          for (let c = 0; c < d; c++) s += (p[i * d + c] - p[j * d + c]) ** 2
          const D = Math.sqrt(s)
          expected += (pd === 3 ? 1 / D : -Math.log(D)) - smearedPairEnergy(pd, D, 0.4, 0.4)
        }
      }
      expect(Math.abs(gap - expected)).toBeLessThan(1e-9 * Math.max(1, Math.abs(FN)))
      // a pair sum the caller already has (Σ_{i<j} g, here summed by the test) replaces the direct one
      let ps = 0
      for (let i = 0; i < 12; i++) {
        for (let j = i + 1; j < 12; j++) {
          let s = 0
          for (let c = 0; c < d; c++) s += (p[i * d + c] - p[j * d + c]) ** 2
          ps += pd === 3 ? 1 / Math.sqrt(s) : -0.5 * Math.log(s)
        }
      }
      const given = electricEnergy(conf(p, d), measure, { rule: { kind: 'fixed', eta: 0.4 }, pairSum: ps })
      expect(Math.abs(given.value - res.value)).toBeLessThan(1e-12 * Math.max(1, Math.abs(res.value)))
      expect(() => electricEnergy(conf(p, d), measure, { rule: { kind: 'fixed', eta: 0.4 }, pairSum: Number.NaN })).toThrow(/pair sum/)
    }
  })
  it('constant density: h^μ(x) − ⟨h^μ⟩_{∂B(x,η)} = c_d m η²/(2d), so value − lowerBound = Σ g(η_i) + 2N Σ c_d m η_i²/(2d) (h^μ is quadratic there, Δh^μ = −c_d m: elementary)', () => {
    const rand = seeded(23)
    for (const { d, R } of [{ d: 2, R: 1.3 }, { d: 3, R: 0.8 }]) {
      const measure = d === 2 ? uniformDisk(R) : uniformBall(R)
      const cd = d === 2 ? 2 * Math.PI : 4 * Math.PI
      const m = d === 2 ? 1 / (Math.PI * R * R) : 3 / (4 * Math.PI * R ** 3)
      const N = 30
      const p = pointsInBall(N, d, 0.7 * R, rand)
      const res = electricEnergy(conf(p, d), measure, { rule: { kind: 'nn-capped' } })
      let expected = 0
      for (let i = 0; i < N; i++) {
        const eta = res.etas[i]
        expect(eta).toBeLessThan(0.3 * R) // the ball stays inside the support
        expected += (d === 2 ? -Math.log(eta) : 1 / eta) + (2 * N * cd * m * eta * eta) / (2 * d)
        expect(Math.abs(measure.potential(p, i * d) - measure.sphereAverage(p, i * d, eta) - (cd * m * eta * eta) / (2 * d))).toBeLessThan(1e-14)
      }
      expect(rel(res.value - res.lowerBound, expected)).toBeLessThan(1e-12)
    }
  })
  it('d = 1: the circle average of the planar potential of the semicircle law (closed form by its Stieltjes transform, quadrature in θ) matches the line-density route', () => {
    const R = Math.SQRT2
    const measure = semicircle(R)
    // planar potential H(z) = −Re[z²/R² − z√(z²−R²)/R² + log((z + √(z²−R²))/2) − ½], √ with its cut on [−R, R]
    const H = (x: number, y: number): number => {
      const sq = csqrt(x - R, y)
      const sp = csqrt(x + R, y)
      const s = cmul(sq, sp)
      const z2 = cmul([x, y], [x, y])
      const zs = cmul([x, y], s)
      const logArg: [number, number] = [(x + s[0]) / 2, (y + s[1]) / 2]
      return -((z2[0] - zs[0]) / (R * R) + Math.log(Math.hypot(logArg[0], logArg[1])) - 0.5)
    }
    for (const [x, eta] of [[0.3, 0.2], [-0.9, 0.05], [1.3, 0.2], [0, 0.5], [1.41, 0.01], [1.0, 1.0]]) {
      const avg = compositeGL(t => H(x + eta * Math.cos(t), eta * Math.sin(t)), 0, Math.PI, 64) / Math.PI
      const defect = lineAverageDefect(measure, x, eta)
      expect(Math.abs(measure.potential([x], 0) - H(x, 0))).toBeLessThan(1e-13)
      expect(Math.abs(measure.potential([x], 0) - defect - avg)).toBeLessThan(1e-11)
    }
  })
  it('the electric gap is non-negative for random radii', () => {
    const rand = seeded(24)
    for (const { d, measure, radius } of setups) {
      for (let k = 0; k < 5; k++) {
        const p = pointsInBall(10, d, radius, rand)
        const res = electricEnergy(conf(p, d), measure, { rule: { kind: 'scaled', factor: 0.2 + rand() } })
        expect(electricGap(nextOrderEnergy(p, d, measure), res)).toBeGreaterThan(-1e-10)
      }
    }
  })
})

describe('electric energy input errors', () => {
  const disk = uniformDisk(1)
  it('names coincident points', () => {
    const p = Float64Array.from([0, 0, 0.5, 0.1, 0, 0])
    for (const rule of [{ kind: 'nn-capped' as const }, { kind: 'fixed' as const, eta: 0.1 }]) {
      try {
        electricEnergy(conf(p, 2), disk, { rule })
        expect.unreachable()
      }
      catch (e) {
        expect(e).toBeInstanceOf(EngineInputError)
        expect((e as EngineInputError).where.indices).toEqual([0, 2])
      }
    }
  })
  it('names a non-finite coordinate, a dimension mismatch and a bad radius', () => {
    try {
      electricEnergy(conf(Float64Array.from([0, 0, Number.NaN, 1]), 2), disk, { rule: { kind: 'nn-capped' } })
      expect.unreachable()
    }
    catch (e) {
      expect(e).toBeInstanceOf(EngineInputError)
      expect((e as EngineInputError).where.index).toBe(1)
    }
    expect(() => electricEnergy(conf(Float64Array.from([0, 0, 0]), 3), disk, { rule: { kind: 'nn-capped' } })).toThrow(/dimension/)
    expect(() => electricEnergy(conf(Float64Array.from([0, 0, 0.5, 0]), 2), disk, { rule: { kind: 'fixed', eta: -1 } })).toThrow(EngineInputError)
    expect(() => electricEnergy({ N: 3, d: 2, points: new Float64Array(4) }, disk, { rule: { kind: 'nn-capped' } })).toThrow(/declares N = 3/)
  })
})

function csqrt(x: number, y: number): [number, number] {
  const r = Math.hypot(x, y)
  const re = Math.sqrt(Math.max(0, (r + x) / 2))
  const im = Math.sqrt(Math.max(0, (r - x) / 2))
  return [re, y < 0 ? -im : im]
}
function cmul(a: [number, number], b: [number, number]): [number, number] {
  return [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
}
