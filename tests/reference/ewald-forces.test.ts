import { describe, it, expect } from 'vitest'
import { torusEnergy, torusEnergyAndGradient } from '../../shared/physics/torus/ewald'
import { cubicLattice, triangularLattice } from '../../shared/physics/torus/lattice'
import type { Lattice } from '../../shared/physics/torus/lattice'
import { groundState } from '../../shared/physics/minimize/ground-state'
import { createRng } from '../../shared/physics/random'
import { seeded } from '../support/uniform-measures'

const routes = ['modes', 'mesh'] as const

/** A jittered square or cubic lattice of side^d points in [0, L)^d: no close pairs, so finite
 *  differences of the energy stay accurate. */
function jittered(d: 2 | 3, side: number, L: number, amount: number, rand: () => number): Float64Array {
  const N = side ** d
  return Float64Array.from({ length: N * d }, (_, k) => {
    const j = Math.floor(k / d)
    const c = k % d
    return ((Math.floor(j / side ** c) % side) + 0.5 + amount * (rand() - 0.5)) * (L / side)
  })
}

function maxAbs(a: ArrayLike<number>): number {
  let m = 0
  for (let k = 0; k < a.length; k++) m = Math.max(m, Math.abs(a[k]))
  return m
}

describe('torus forces in closed form', () => {
  it('match fourth-order central differences of the energy (common practice), 2-D log and 3-D Coulomb, both reciprocal routes', () => {
    const rand = seeded(41)
    const cases: Array<[Lattice, 2 | 3, Float64Array]> = [
      [cubicLattice(2, 8), 2, jittered(2, 8, 8, 0.6, rand)],
      [cubicLattice(3, 4), 3, jittered(3, 4, 4, 0.6, rand)],
    ]
    for (const [lattice, d, points] of cases) {
      for (const reciprocal of routes) {
        const { gradient } = torusEnergyAndGradient(lattice, points, { reciprocal })
        const h = 1e-3
        for (const k of [0, 5, 17, d * 9 + 1]) {
          const at = (t: number): number => {
            const moved = points.slice()
            moved[k] += t * h
            return torusEnergy(lattice, moved, { reciprocal }).value
          }
          const fd = (-at(2) + 8 * at(1) - 8 * at(-1) + at(-2)) / (12 * h)
          expect(Math.abs(gradient[k] - fd), `${reciprocal} d=${d} coordinate ${k}`).toBeLessThan(1e-8 * Math.max(1, maxAbs(gradient)))
        }
      }
    }
  })
  it('do not depend on the splitting parameter α (uniform and clustered points, triangular and cubic cells; the energy does not, so neither does its gradient)', () => {
    const rand = seeded(42)
    for (const [lattice, d, N] of [[triangularLattice(60), 2, 60], [cubicLattice(3, 3.5), 3, 43]] as const) {
      const L = Math.sqrt(lattice.basis[0] ** 2 + lattice.basis[1] ** 2)
      const uniform = Float64Array.from({ length: N * d }, () => 2 * L * rand() - L)
      const clustered = Float64Array.from({ length: N * d }, () => 0.2 * L * rand())
      for (const points of [uniform, clustered]) {
        const ref = torusEnergyAndGradient(lattice, points, { reciprocal: 'modes', alpha: 2 }).gradient
        for (const reciprocal of routes) {
          for (const alpha of [0.6, 9]) {
            const g = torusEnergyAndGradient(lattice, points, { reciprocal, alpha }).gradient
            let worst = 0
            for (let k = 0; k < g.length; k++) worst = Math.max(worst, Math.abs(g[k] - ref[k]))
            expect(worst, `${reciprocal} α=${alpha}`).toBeLessThan(1e-11 * Math.max(1, maxAbs(ref)))
          }
        }
      }
    }
  })
  it('vanish on a perfect lattice (each point is a centre of symmetry, common practice) and sum to zero (Newton’s third law)', () => {
    const rand = seeded(43)
    const perfect = jittered(2, 10, 10, 0, rand)
    const uniform = Float64Array.from({ length: 2 * 150 }, () => 10 * rand())
    for (const reciprocal of routes) {
      const still = torusEnergyAndGradient(cubicLattice(2, 10), perfect, { reciprocal })
      expect(maxAbs(still.gradient)).toBeLessThan(1e-11)
      const moving = torusEnergyAndGradient(cubicLattice(2, 10), uniform, { reciprocal })
      let nx = 0
      let ny = 0
      for (let i = 0; i < 150; i++) {
        nx += moving.gradient[2 * i]
        ny += moving.gradient[2 * i + 1]
      }
      expect(maxAbs(moving.gradient)).toBeGreaterThan(1)
      // pair terms cancel exactly; the mesh's interpolation leaves a net force within its accuracy
      expect(Math.abs(nx) + Math.abs(ny), reciprocal).toBeLessThan(reciprocal === 'modes' ? 1e-10 : 1e-8)
    }
  })
  it('with signed charges: the ions of rock salt feel no force (cubic symmetry), and a displaced ion’s force matches the energy’s difference quotient', () => {
    const cell = [0, 0, 0, 1, 1, 0, 1, 0, 1, 0, 1, 1, 1, 0, 0, 0, 1, 0, 0, 0, 1, 1, 1, 1]
    const charges = Float64Array.from([1, 1, 1, 1, -1, -1, -1, -1])
    for (const reciprocal of routes) {
      const still = torusEnergyAndGradient(cubicLattice(3, 2), Float64Array.from(cell), { charges, reciprocal })
      expect(maxAbs(still.gradient)).toBeLessThan(1e-11)
      const moved = Float64Array.from(cell)
      moved[0] += 0.05
      const r = torusEnergyAndGradient(cubicLattice(3, 2), moved, { charges, reciprocal })
      // (no sign is asserted: by Earnshaw's theorem a charge has no stable equilibrium, and at a site of
      // cubic symmetry the Hessian is traceless and isotropic, hence zero)
      expect(Math.abs(r.gradient[0])).toBeGreaterThan(1e-3)
      const h = 1e-4
      const plus = Float64Array.from(moved)
      plus[0] += h
      const minus = Float64Array.from(moved)
      minus[0] -= h
      const fd = (torusEnergy(cubicLattice(3, 2), plus, { charges, reciprocal }).value - torusEnergy(cubicLattice(3, 2), minus, { charges, reciprocal }).value) / (2 * h)
      expect(Math.abs(r.gradient[0] - fd)).toBeLessThan(1e-6)
    }
  })
  it('drive the ground-state search on the torus to a stationary point (30 points; the N = 2 case with its known answer is in minimize.test.ts)', () => {
    const result = groundState({ N: 30, kernel: { name: 'log' }, geometry: { kind: 'torus', d: 2, L: 5 }, restarts: 1 }, createRng(7))
    const again = torusEnergyAndGradient(cubicLattice(2, 5), result.best.points)
    expect(Math.abs(again.value - result.energy)).toBeLessThan(1e-9 * Math.abs(result.energy))
    // the true gradient at the result, not the minimiser's own stopping test
    expect(maxAbs(again.gradient)).toBeLessThan(1e-4)
    expect(result.runs[0]!.converged).toBe(true)
  })
})
