import { describe, it, expect } from 'vitest'
import { electricEnergy } from '../../shared/physics/electric'
import type { EtaRule } from '../../shared/physics/electric'
import { gridElectricEnergy } from '../support/poisson-grid'
import { pointsInBall, seeded, uniformDisk } from '../support/uniform-measures'

// An independent route to the 2-D electric energy (Sandier & Serfaty, Ann. Probab. 43, 2015): solve
// −Δh = 2π(Σ δ^{(η_i)}_{x_i} − Nμ) by bilinear finite elements on a box with the exact far-field potential
// as Dirichlet data, and integrate |∇h|²/(2π) (tests/support/poisson-grid.ts). The potential has gradient
// jumps on the circles, so the Galerkin energy converges at first order in the mesh size h and from below
// (Galerkin orthogonality: the discrete energy is the exact one minus the energy of the error;
// Strang & Fix, An Analysis of the Finite Element Method, 1973, ch. 1 and 3). Each circle carries a
// gradient jump 1/η_i over a length 2πη_i, so the stated discretisation error is
// E − E_h ≈ C h Σ_i 1/η_i; C ≈ 0.15 was measured on these configurations at h = 2.5/512 … 2.5/2048,
// and the test allows C ≤ 0.2.
describe('electric energy against a grid Poisson solve (2-D, uniform disk background)', () => {
  const rand = seeded(41)
  const cases: Array<{ N: number, rule: EtaRule, overlapping: boolean }> = [
    { N: 6, rule: { kind: 'fixed', eta: 0.2 }, overlapping: true },
    { N: 8, rule: { kind: 'fixed', eta: 0.35 }, overlapping: true },
    { N: 7, rule: { kind: 'nn-capped' }, overlapping: false },
  ]
  for (const { N, rule, overlapping } of cases) {
    const points = overlapping ? pointsInBall(N, 2, 0.7, rand) : spreadPoints(N, 0.7, 0.35, rand)
    it(`N = ${N}, rule ${rule.kind}${rule.kind === 'fixed' ? ` η = ${rule.eta}` : ''}: E − E_h within the stated O(h) error, 5e-5 after Richardson extrapolation`, () => {
      const res = electricEnergy({ N, d: 2, points }, uniformDisk(1), { rule })
      if (overlapping) expect(res.overlaps).toBeGreaterThan(0)
      else expect(res.overlaps).toBe(0)
      const problem = { centres: points, etas: res.etas, R: 1, B: 1.25 }
      const coarse = gridElectricEnergy(problem, 512)
      const fine = gridElectricEnergy(problem, 1024)
      const err = (v: number): number => (res.value - v) / Math.abs(res.value)
      const h = 2.5 / 1024
      const stated = (0.2 * h * res.etas.reduce((t, e) => t + 1 / e, 0)) / Math.abs(res.value)
      expect(err(fine)).toBeGreaterThan(0) // from below
      expect(err(fine)).toBeLessThan(stated)
      expect(err(coarse) / err(fine)).toBeGreaterThan(1.7) // first-order convergence to the engine's value
      expect(err(coarse) / err(fine)).toBeLessThan(2.3)
      expect(Math.abs(err(2 * fine - coarse))).toBeLessThan(5e-5)
    })
  }
})

/** N points in the disk of radius r, pairwise at least `gap` apart (rejection sampling). */
function spreadPoints(N: number, r: number, gap: number, rand: () => number): Float64Array {
  const out: number[] = []
  while (out.length < 2 * N) {
    const [x, y] = pointsInBall(1, 2, r, rand)
    let ok = true
    for (let k = 0; k < out.length; k += 2) if (Math.hypot(out[k] - x, out[k + 1] - y) < gap) ok = false
    if (ok) out.push(x, y)
  }
  return Float64Array.from(out)
}
