// The structure factor on configurations with known answers (geometry and identities).
import { describe, it, expect } from 'vitest'
import { freeStructureFactor, structureFactorAt, torusStructureFactor } from '../../../../shared/physics/statistics/structure-factor'
import { createTestRng } from '../../../support/stat-samples'

describe('structure factor', () => {
  it('a square lattice n×n in the box [0, n)² has S = N at the lattice\'s reciprocal vectors and 0 elsewhere', () => {
    const n = 6
    const pts = new Float64Array(2 * n * n)
    for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) {
      pts[2 * (i * n + j)] = i + 0.25
      pts[2 * (i * n + j) + 1] = j + 0.5
    }
    const c = { N: n * n, d: 2, points: pts }
    const k0 = (2 * Math.PI) / n
    expect(structureFactorAt(c, [k0 * n, 0])).toBeCloseTo(n * n, 9)
    expect(structureFactorAt(c, [k0, 2 * k0])).toBeCloseTo(0, 9)
    const t = torusStructureFactor([c, c], { L: n, nmax: 5, uniform: Math.random })
    for (const row of t.rows) expect(row.S).toBeCloseTo(0, 9)
  })

  it('the recurrence for e^{ikx} agrees with direct evaluation for high |n| (1-D)', () => {
    const rng = createTestRng(61)
    const L = 13
    const pts = Float64Array.from({ length: 50 }, () => rng.uniform() * L)
    const c = { N: 50, d: 1, points: pts }
    const t = torusStructureFactor([c], { L, nmax: 40, uniform: Math.random })
    for (const row of t.rows) expect(row.S).toBeCloseTo(structureFactorAt(c, [row.k]), 10)
    expect(t.rows.length).toBe(40)
  })

  it('radial bins in d = 2, 3 average S over the wave vectors in the bin (checked by direct evaluation)', () => {
    const rng = createTestRng(62)
    const L = 4
    const pts = Float64Array.from({ length: 3 * 30 }, () => rng.uniform() * L)
    const c = { N: 30, d: 3, points: pts }
    const t = torusStructureFactor([c], { L, nmax: 2, bins: 1, uniform: Math.random })
    let s = 0
    let count = 0
    const k0 = (2 * Math.PI) / L
    for (let a = -2; a <= 2; a++) for (let b = -2; b <= 2; b++) for (let e = -2; e <= 2; e++) {
      const n2 = a * a + b * b + e * e
      if (n2 === 0 || n2 > 4) continue
      s += structureFactorAt(c, [k0 * a, k0 * b, k0 * e])
      count++
    }
    expect(t.rows[0].S).toBeCloseTo(s / count, 10)
    expect(t.rows[0].vectors).toBe(count / 2)
  })

  it('free-space S(k) of a single point is 1 and of two points 1 + cos(k·Δ) averaged over directions', () => {
    const one = freeStructureFactor([{ N: 1, d: 2, points: Float64Array.from([0.3, 0.1]) }], { k: [1, 2], uniform: Math.random })
    for (const row of one.rows) expect(row.S).toBeCloseTo(1, 14)
    const two = freeStructureFactor([{ N: 2, d: 1, points: Float64Array.from([0, 1]) }], { k: [0.7], uniform: Math.random })
    expect(two.rows[0].S).toBeCloseTo(1 + Math.cos(0.7), 14)
  })
})
