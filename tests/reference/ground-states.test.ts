import { describe, it, expect } from 'vitest'
import { groundState } from '../../shared/physics/minimize/ground-state'
import { createRng } from '../../shared/physics/random'
import { quadraticPotential } from '../../shared/physics/potentials/presets'
import { symmetricTridiagonalEigenvalues } from '../../shared/physics/linalg/tridiagonal'

// Minimal Coulomb energies Σ_{i<j} 1/|x_i − x_j| on the unit sphere (the Thomson problem).
const THOMSON: Array<[number, number]> = [
  [2, 0.5], // antipodal pair (elementary closed form)
  [3, Math.sqrt(3)], // equilateral triangle on a great circle (elementary closed form)
  [4, 3.674234614], // regular tetrahedron, 6/√(8/3); Wales, McKay & Altschuler, Phys. Rev. B 79 (2009), table
  [5, 6.474691495], // Wales, McKay & Altschuler 2009, table
  [6, 9.985281374], // Wales, McKay & Altschuler 2009, table
  [7, 14.452977414], // Wales, McKay & Altschuler 2009 (value recalled from memory)
  [8, 19.675287861], // Wales, McKay & Altschuler 2009 (value recalled from memory)
  [9, 25.759986531], // Wales, McKay & Altschuler 2009 (value recalled from memory)
  [10, 32.71694946], // Wales, McKay & Altschuler 2009 (value recalled from memory)
  [11, 40.59645051], // Wales, McKay & Altschuler 2009 (value recalled from memory)
  [12, 49.165253058], // Wales, McKay & Altschuler 2009 (value recalled from memory)
]

// Minimal logarithmic energies Σ_{i<j} log(1/|x_i − x_j|) on the unit sphere (Ridgway & Cheviakov,
// Comput. Phys. Commun. 233, 2018). Each entry is also the energy of a configuration in closed form: the
// antipodal pair, the equilateral triangle, the regular tetrahedron, the triangular bipyramid
// (−4 log 2 − (3/2) log 3) and the octahedron (elementary).
const LOG_SPHERE: Array<[number, number]> = [
  [2, -Math.log(2)],
  [3, -1.5 * Math.log(3)],
  [4, 3 * Math.log(3 / 8)],
  [5, -4.4205071552],
  [6, -9 * Math.log(2)],
]

describe('ground states on the sphere', () => {
  it('Thomson problem N = 2 … 12 to 1e−7 with seeded restarts', () => {
    for (const [N, E] of THOMSON) {
      const r = groundState({ N, kernel: { name: 'riesz', s: 1 }, geometry: { kind: 'sphere' }, restarts: 6 }, createRng(`thomson-${N}`))
      expect(Math.abs(r.pairSum - E)).toBeLessThan(1e-7)
      // canonical energy counts every ordered pair: H = 2 Σ_{i<j}
      expect(r.energy).toBeCloseTo(2 * r.pairSum, 12)
      for (let i = 0; i < N; i++) expect(Math.hypot(r.best.points[3 * i], r.best.points[3 * i + 1], r.best.points[3 * i + 2])).toBeCloseTo(1, 14)
    }
  })

  it('logarithmic energy N = 2 … 6 to 1e−8', () => {
    for (const [N, E] of LOG_SPHERE) {
      const r = groundState({ N, kernel: { name: 'log' }, geometry: { kind: 'sphere' }, restarts: 4 }, createRng(`log-${N}`))
      expect(Math.abs(r.pairSum - E)).toBeLessThan(1e-8)
    }
  })
})

describe('one-dimensional log-gas ground state (Stieltjes, Acta Math. 6, 1885)', () => {
  it('minimisers with V = a x² are the zeros of H_N scaled by 1/√(N a)', () => {
    // Stieltjes: Σ_{i<j} −log|y_i − y_j| + ½ Σ y_i² is minimal at the zeros of the Hermite polynomial H_N.
    // Canonical H = 2Σ_{i<j} −log|x_i − x_j| + N a Σ x_i² = 2[Σ_{i<j} −log|y_i − y_j| + ½ Σ y_i²] + const for y = √(N a) x.
    // Zeros of H_N: eigenvalues of its Jacobi matrix (Golub & Welsch, Math. Comp. 23, 1969), polished by Newton on
    // H_{k+1} = 2x H_k − 2k H_{k−1} (Abramowitz & Stegun, ch. 22).
    for (const [N, a] of [[6, 1], [11, 0.5]] as const) {
      const jacobi = symmetricTridiagonalEigenvalues(new Float64Array(N), Float64Array.from({ length: N - 1 }, (_, k) => Math.sqrt((k + 1) / 2)))
      const zeros = Array.from(jacobi, (x) => {
        for (let it = 0; it < 3; it++) {
          let p0 = 1
          let p1 = 2 * x
          for (let k = 1; k < N; k++) {
            const p2 = 2 * x * p1 - 2 * k * p0
            p0 = p1
            p1 = p2
          }
          x -= p1 / (2 * N * p0)
        }
        return x
      })
      const r = groundState({ N, kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential: quadraticPotential(a, 1), restarts: 3, lbfgs: { gradientTolerance: 1e-12 } }, createRng(`stieltjes-${N}`))
      const x = Array.from(r.best.points).sort((p, q) => p - q)
      x.forEach((v, i) => expect(Math.abs(v * Math.sqrt(N * a) - zeros[i])).toBeLessThan(1e-7))
    }
  })
})
