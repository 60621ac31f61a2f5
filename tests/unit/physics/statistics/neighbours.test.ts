// Cell-list neighbour searches against brute force (common practice), in free space and with minimum
// images on the periodic box, d = 1, 2, 3.
import { describe, it, expect } from 'vitest'
import { buildCellList, countWithin, forEachNeighbour } from '../../../../shared/physics/statistics/cell-list'
import { nearestNeighbourDistances, nearestNeighbourDistribution } from '../../../../shared/physics/statistics/nearest-neighbour'
import { sphereFractionInBall, pairCorrelation } from '../../../../shared/physics/statistics/pair-correlation'
import { EngineInputError } from '../../../../shared/physics/errors'
import { createTestRng } from '../../../support/stat-samples'

function brute(points: Float64Array, d: number, L?: number): Float64Array {
  const N = points.length / d
  const out = new Float64Array(N).fill(Infinity)
  for (let i = 0; i < N; i++) {
    for (let j = 0; j < N; j++) {
      if (i === j) continue
      let s = 0
      for (let k = 0; k < d; k++) {
        let dx = points[i * d + k] - points[j * d + k]
        if (L !== undefined) dx -= L * Math.round(dx / L)
        s += dx * dx
      }
      out[i] = Math.min(out[i], Math.sqrt(s))
    }
  }
  return out
}

describe('nearest neighbours', () => {
  for (const d of [1, 2, 3]) {
    for (const L of [undefined, 3]) {
      it(`match brute force in d = ${d}, ${L === undefined ? 'free space (clustered points)' : 'periodic box'}`, () => {
        const rng = createTestRng(40 + d)
        const N = 300
        const p = Float64Array.from({ length: N * d }, (_, k) => L === undefined ? (k < 30 * d ? 0.01 * rng.uniform() : 5 * rng.normal()) : rng.uniform() * L)
        expect(Array.from(nearestNeighbourDistances(buildCellList(p, d, L)))).toEqual(Array.from(brute(p, d, L)))
      })
    }
  }

  it('periodic distances wrap: two points near opposite sides are close', () => {
    const list = buildCellList(Float64Array.from([0.1, 5, 9.95, 5, 5, 0.5]), 2, 10)
    const r = nearestNeighbourDistances(list)
    expect(r[0]).toBeCloseTo(0.15, 12)
    expect(r[1]).toBeCloseTo(0.15, 12)
  })

  it('countWithin and forEachNeighbour match brute force on the periodic box', () => {
    const rng = createTestRng(44)
    const L = 4
    const p = Float64Array.from({ length: 400 }, () => rng.uniform() * L)
    const list = buildCellList(p, 2, L, 0.7)
    for (let q = 0; q < 50; q++) {
      const y = [rng.uniform() * L, rng.uniform() * L]
      const r = 2 * rng.uniform()
      let n = 0
      for (let i = 0; i < 200; i++) {
        let dx = p[2 * i] - y[0]
        let dy = p[2 * i + 1] - y[1]
        dx -= L * Math.round(dx / L)
        dy -= L * Math.round(dy / L)
        if (dx * dx + dy * dy <= r * r) n++
      }
      expect(countWithin(list, y, r)).toBe(n)
    }
    const seen: number[] = []
    forEachNeighbour(list, 0, 0.7, j => seen.push(j))
    expect(new Set(seen).size).toBe(seen.length)
  })

  it('the table names its parameters and rejects single-point configurations', () => {
    const t = nearestNeighbourDistribution([{ N: 1, d: 2, points: Float64Array.from([0, 0]) }, { N: 3, d: 2, points: Float64Array.from([0, 0, 1, 0, 0, 2]) }], { window: { kind: 'ball', center: [0, 0], radius: 5 }, bins: 4, rmax: 2, uniform: Math.random })
    expect(t.rejected).toEqual([{ configuration: 0, reason: 'fewer than two points' }])
    expect(t.summary.meanDistance).toBeCloseTo((1 + 1 + 2) / 3, 14)
    expect(t.parameters.bins).toBe(4)
  })
})

describe('edge correction', () => {
  it('the fraction of a circle inside a disk matches direct angular counting (d = 2) and the hat-box law (d = 3)', () => {
    const R = 1
    for (const [rho, r] of [[0.5, 0.8], [0.9, 0.3], [0.2, 1.1]]) {
      let inside = 0
      const K = 200000
      for (let k = 0; k < K; k++) {
        const t = (2 * Math.PI * (k + 0.5)) / K
        if (Math.hypot(rho + r * Math.cos(t), r * Math.sin(t)) <= R) inside++
      }
      expect(sphereFractionInBall(2, rho, r, R)).toBeCloseTo(inside / K, 4)
      // d = 3: fraction of the sphere by Gauss–Legendre-free midpoint integration over the polar angle
      let s = 0
      const J = 200000
      for (let j = 0; j < J; j++) {
        const th = (Math.PI * (j + 0.5)) / J
        const z = Math.cos(th)
        if (Math.hypot(rho + r * z, r * Math.sin(th)) <= R) s += 0.5 * Math.sin(th) * (Math.PI / J)
      }
      expect(sphereFractionInBall(3, rho, r, R)).toBeCloseTo(s, 4)
    }
  })

  it('refuses rmax beyond half the periodic box and names the configuration with a non-finite coordinate', () => {
    const c = { N: 2, d: 2, points: Float64Array.from([0, 0, 1, 1]) }
    expect(() => pairCorrelation([c], { window: { kind: 'torus', L: 2 }, rmax: 1.5, uniform: Math.random })).toThrow(/L\/2/)
    const bad = { N: 2, d: 2, points: Float64Array.from([0, 0, Number.NaN, 1]) }
    try {
      pairCorrelation([c, bad], { window: { kind: 'torus', L: 2 }, uniform: Math.random })
      expect.unreachable()
    }
    catch (e) {
      expect(e).toBeInstanceOf(EngineInputError)
      expect((e as EngineInputError).where).toEqual({ configuration: 1, index: 1 })
    }
  })
})
