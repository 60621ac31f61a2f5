import { describe, it, expect } from 'vitest'
import { fmm2dEnergy } from '../../shared/physics/fast/fmm2d'
import { treecodeEnergy } from '../../shared/physics/fast/treecode'
import { wasmPairSum } from '../../shared/physics/fast/wasm'
import { PairPool } from '../../server/engine/pool'

function circle(N: number, d: 2 | 3): Float64Array {
  const p = new Float64Array(d * N)
  for (let k = 0; k < N; k++) {
    p[d * k] = Math.cos((2 * Math.PI * k) / N)
    p[d * k + 1] = Math.sin((2 * Math.PI * k) / N)
  }
  return p
}

describe('fast and SIMD pair sums against closed forms and published energies', () => {
  it('N-th roots of unity: Σ_{i<j} −log|ω^i − ω^j| = −(N/2) log N, by the FMM at 1e−4, 1e−8, 1e−12', () => {
    // Π_{k=1}^{N−1} |1 − ω^k| = N (derivative of z^N − 1 at z = 1; Saff & Totik, Logarithmic
    // Potentials with External Fields, 1997, ch. III — Fekete points of the circle)
    const N = 16384
    const points = circle(N, 2)
    const exact = -(N / 2) * Math.log(N)
    expect(Math.abs(wasmPairSum(points, 2, { name: 'log' }, { kind: 'free', d: 2 }) - exact)).toBeLessThanOrEqual(1e-12 * Math.abs(exact))
    for (const tolerance of [1e-4, 1e-8, 1e-12]) {
      const r = fmm2dEnergy(points, { tolerance })
      // the closed form itself carries rounding of about 1e−15 relative in the points
      expect(Math.abs(r.value - exact) / Math.abs(exact)).toBeLessThanOrEqual(tolerance + 1e-12)
    }
  }, 30_000)

  it('N points evenly spaced on a circle in R³: Σ 1/|x_i − x_j| = (N/2) Σ_{k=1}^{N−1} 1/(2 sin(πk/N)), by the tree code', () => {
    // |ω^i − ω^j| = 2 sin(π|i − j|/N) (derived; common practice)
    const N = 3000
    const points = circle(N, 3)
    let s = 0
    for (let k = 1; k < N; k++) s += 1 / (2 * Math.sin((Math.PI * k) / N))
    const exact = (N / 2) * s
    expect(Math.abs(wasmPairSum(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }) - exact) / exact).toBeLessThanOrEqual(1e-12)
    const r = treecodeEnergy(points, 3, { name: 'coulomb' }, { kind: 'free', d: 3 }, { tolerance: 1e-6 })
    expect(Math.abs(r.value - exact) / exact).toBeLessThanOrEqual(1e-6)
  }, 30_000)

  const tetra = new Float64Array([1, 1, 1, 1, -1, -1, -1, 1, -1, -1, -1, 1].map(v => v / Math.sqrt(3)))
  const bipyramid = new Float64Array([0, 0, 1, 0, 0, -1, 1, 0, 0, -0.5, Math.sqrt(3) / 2, 0, -0.5, -Math.sqrt(3) / 2, 0])
  const octahedron = new Float64Array([1, 0, 0, -1, 0, 0, 0, 1, 0, 0, -1, 0, 0, 0, 1, 0, 0, -1])

  it('Thomson problem minima N = 4, 5, 6 (Wales, McKay & Altschuler, Phys. Rev. B 79, 2009)', async () => {
    // 3.674234614, 6.474691495, 9.985281374 (tabulated to 1e−9)
    const cases: Array<[Float64Array, number]> = [[tetra, 3.674234614], [bipyramid, 6.474691495], [octahedron, 9.985281374]]
    const pool = new PairPool({ threads: 2 })
    try {
      for (const [points, value] of cases) {
        expect(Math.abs(wasmPairSum(points, 3, { name: 'coulomb' }, { kind: 'sphere' }) - value)).toBeLessThanOrEqual(1e-8)
        expect(Math.abs((await pool.pairSum(points, 3, { name: 'riesz', s: 1 }, { kind: 'sphere' })).value - value)).toBeLessThanOrEqual(1e-8)
        // leaves of one point: every accepted node is an exact monopole or a multipole of a group
        const r = treecodeEnergy(points, 3, { name: 'riesz', s: 1 }, { kind: 'sphere' }, { tolerance: 1e-10, leafSize: 1, theta: 0.5 })
        expect(Math.abs(r.value - value)).toBeLessThanOrEqual(1e-8)
      }
    }
    finally {
      await pool.close()
    }
  })

  it('logarithmic minima on S² N = 4, 5, 6 (Ridgway & Cheviakov, Comput. Phys. Commun. 233, 2018)', () => {
    // 3 log(3/8), −4.4205071552, −9 log 2
    const cases: Array<[Float64Array, number]> = [[tetra, 3 * Math.log(3 / 8)], [bipyramid, -4.4205071552], [octahedron, -9 * Math.log(2)]]
    for (const [points, value] of cases) {
      expect(Math.abs(wasmPairSum(points, 3, { name: 'log' }, { kind: 'sphere' }) - value)).toBeLessThanOrEqual(1e-9)
      const r = treecodeEnergy(points, 3, { name: 'log' }, { kind: 'sphere' }, { order: 30, leafSize: 1, theta: 0.5 })
      expect(Math.abs(r.value - value)).toBeLessThanOrEqual(1e-9)
    }
  })
})
