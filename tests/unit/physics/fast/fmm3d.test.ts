import { describe, it, expect } from 'vitest'
import { EngineInputError } from '../../../../shared/physics/errors'
import { CompensatedSum } from '../../../../shared/physics/summation'
import { fmm3dEnergy, fmm3dFields, fmm3dOrder, fmm3dPairBound } from '../../../../shared/physics/fast/fmm3d'
import { clustered, lattice, relErr, seeded, uniform } from './configurations'

/** Direct compensated potentials φ_i = Σ_{j≠i} 1/|x_i − x_j| and energy ½ Σ φ_i (reference). */
function direct(points: Float64Array): { potential: Float64Array, energy: number } {
  const N = points.length / 3
  const potential = new Float64Array(N)
  const total = new CompensatedSum()
  for (let i = 0; i < N; i++) {
    const acc = new CompensatedSum()
    for (let j = 0; j < N; j++) {
      if (j === i) continue
      const dx = points[3 * i] - points[3 * j]
      const dy = points[3 * i + 1] - points[3 * j + 1]
      const dz = points[3 * i + 2] - points[3 * j + 2]
      acc.add(1 / Math.sqrt(dx * dx + dy * dy + dz * dz))
    }
    potential[i] = acc.value
    total.add(acc.value)
  }
  return { potential, energy: 0.5 * total.value }
}

/** Cubic lattice with spacing 1 and a seeded jitter of amplitude 0.05. */
function jitteredLattice(N: number, seed: number): Float64Array {
  const p = lattice(N, 3, 1)
  const rnd = seeded(seed)
  for (let k = 0; k < p.length; k++) p[k] += 0.05 * (2 * rnd() - 1)
  return p
}

describe('fmm3d order and bound', () => {
  it('the order is the smallest with (1 + θ)θ^(p+1)/(1 − θ) ≤ tolerance (geometric series, common practice)', () => {
    for (const [theta, tol] of [[0.5, 1e-3], [0.4, 1e-6], [0.3, 1e-10]]) {
      const p = fmm3dOrder(theta, tol)
      expect(fmm3dPairBound(theta, p)).toBeCloseTo((1 + theta) * Math.pow(theta, p + 1) / (1 - theta), 15)
      expect(fmm3dPairBound(theta, p)).toBeLessThanOrEqual(tol)
      expect(fmm3dPairBound(theta, p - 1)).toBeGreaterThan(tol)
    }
  })
})

describe('fmm3d against direct compensated sums', () => {
  // leaf size 24 for the lattice: its cells are full cubes, so far pairs need a few levels
  // the last entry: leaf size and direct-sum threshold with which (nearly) every far pair of cells is
  // expanded (at these sizes most would be summed directly)
  const cases: Array<[string, Float64Array, number | undefined, { leafSize: number, farDirectUpTo: number }]> = [
    ['uniform cube', uniform(1500, 3, 21), undefined, { leafSize: 32, farDirectUpTo: 0 }],
    ['Gaussian blobs of scales 1, 1e−2, 1e−5', clustered(1500, 3, 22), undefined, { leafSize: 32, farDirectUpTo: 0 }],
    ['jittered cubic lattice', jitteredLattice(1331, 23), 24, { leafSize: 8, farDirectUpTo: 100 }],
  ]
  for (const [name, points, leafSize, expanded] of cases) {
    it(`${name}: energy and potentials within 1e−3, 1e−6, 1e−10`, () => {
      const ref = direct(points)
      const N = points.length / 3
      for (const tolerance of [1e-3, 1e-6, 1e-10]) {
        const e = fmm3dEnergy(points, { tolerance, leafSize })
        expect(e.method).toBe('fmm3d')
        expect(e.errorBound).toBeLessThanOrEqual(tolerance)
        expect(relErr(e.value, ref.energy)).toBeLessThanOrEqual(tolerance)
        // with far pairs expanded, the measured error must also respect the stated bound (up to
        // rounding, 1e−13)
        const small = fmm3dEnergy(points, { tolerance, ...expanded })
        expect(small.parameters.cellInteractions).toBeGreaterThan(0)
        expect(small.errorBound).toBeLessThanOrEqual(tolerance)
        expect(relErr(small.value, ref.energy)).toBeLessThanOrEqual(small.errorBound + 1e-13)
        const f = fmm3dFields(points, { tolerance, leafSize })
        let worst = 0
        for (let i = 0; i < N; i++) worst = Math.max(worst, relErr(f.potential[i], ref.potential[i]))
        expect(worst).toBeLessThanOrEqual(tolerance)
        expect(worst).toBeLessThanOrEqual(f.potentialErrorBound)
      }
    }, 60_000)
  }
})

describe('fmm3d forces', () => {
  it('F_i = −∂E/∂x_i by central differences of the direct energy (h = 1e−5, |ΔF| ≤ 1e−6 max|F|)', () => {
    const N = 400
    const points = uniform(N, 3, 31)
    const f = fmm3dFields(points, { tolerance: 1e-10, leafSize: 16 })
    expect(f.parameters.cellInteractions).toBeGreaterThan(0)
    let fmax = 0
    for (const v of f.force) fmax = Math.max(fmax, Math.abs(v))
    const h = 1e-5
    // E depends on x_i through Σ_{j≠i} 1/|x_i − x_j| only
    const partial = (i: number, x: Float64Array): number => {
      const acc = new CompensatedSum()
      for (let j = 0; j < N; j++) {
        if (j === i) continue
        acc.add(1 / Math.hypot(x[0] - points[3 * j], x[1] - points[3 * j + 1], x[2] - points[3 * j + 2]))
      }
      return acc.value
    }
    for (const i of [0, 57, 199, 399]) {
      for (let k = 0; k < 3; k++) {
        const xp = Float64Array.from(points.subarray(3 * i, 3 * i + 3))
        const xm = Float64Array.from(xp)
        xp[k] += h
        xm[k] -= h
        const fd = -(partial(i, xp) - partial(i, xm)) / (2 * h)
        expect(Math.abs(f.force[3 * i + k] - fd)).toBeLessThanOrEqual(1e-6 * fmax)
      }
    }
  }, 60_000)
})

describe('fmm3d determinism and inputs', () => {
  it('two runs agree bit for bit', () => {
    const points = clustered(2000, 3, 41)
    const a = fmm3dFields(points, { tolerance: 1e-6 })
    const b = fmm3dFields(points, { tolerance: 1e-6 })
    expect(a.parameters.cellInteractions).toBeGreaterThan(0)
    expect(Buffer.from(a.potential.buffer).equals(Buffer.from(b.potential.buffer))).toBe(true)
    expect(Buffer.from(a.force.buffer).equals(Buffer.from(b.force.buffer))).toBe(true)
    expect(Object.is(fmm3dEnergy(points, { tolerance: 1e-6 }).value, fmm3dEnergy(points, { tolerance: 1e-6 }).value)).toBe(true)
  }, 60_000)

  it('coincident points raise an EngineInputError naming both indices', () => {
    const points = uniform(500, 3, 42)
    points.set(points.subarray(3 * 3, 3 * 3 + 3), 3 * 170)
    let caught: unknown
    try {
      fmm3dEnergy(points, { tolerance: 1e-6 })
    }
    catch (e) {
      caught = e
    }
    expect(caught).toBeInstanceOf(EngineInputError)
    expect(String((caught as Error).message)).toContain('points 3 and 170 coincide')
  })

  it('closed forms (common practice): two points 1/d, regular tetrahedron of edge 1 → 6, unit cube 12 + 12/√2 + 4/√3', () => {
    expect(fmm3dEnergy(Float64Array.from([0, 0, 0, 0.3, 0.4, 0]), { tolerance: 1e-10 }).value).toBeCloseTo(2, 14)
    const s = 1 / Math.sqrt(2)
    const tetra = Float64Array.from([1, 1, 1, 1, -1, -1, -1, 1, -1, -1, -1, 1].map(v => v * s / 2))
    expect(fmm3dEnergy(tetra, { tolerance: 1e-10 }).value).toBeCloseTo(6, 13)
    const cube: number[] = []
    for (let m = 0; m < 8; m++) cube.push(m & 1, (m >> 1) & 1, (m >> 2) & 1)
    // leaf size 1 so that the cube's corners interact through expansions as well as directly
    const r = fmm3dEnergy(Float64Array.from(cube), { tolerance: 1e-10, leafSize: 1 })
    expect(r.value).toBeCloseTo(12 + 12 / Math.sqrt(2) + 4 / Math.sqrt(3), 12)
    expect(fmm3dEnergy(new Float64Array(0)).value).toBe(0)
    expect(fmm3dEnergy(Float64Array.from([1, 2, 3])).value).toBe(0)
  })
})
