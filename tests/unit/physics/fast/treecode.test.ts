import { describe, it, expect } from 'vitest'
import type { Geometry, Kernel } from '../../../../shared/physics/types'
import { pairSum } from '../../../../shared/physics/energy'
import { EngineInputError } from '../../../../shared/physics/errors'
import { logPairTail, rieszTail, treecodeEnergy, treecodeFields } from '../../../../shared/physics/fast/treecode'
import { fmm3dEnergy, fmm3dFields } from '../../../../shared/physics/fast/fmm3d'
import { wasmPairSum } from '../../../../shared/physics/fast/wasm'
import { directFields } from '../../../../shared/physics/fast/direct'
import { clustered, lattice, relErr, sphere, uniform } from './configurations'

const free3: Geometry = { kind: 'free', d: 3 }

describe('tree code truncation bounds', () => {
  it('δ(θ, p, s) has the closed forms of the geometric series for s = 1 and s = 2 (common practice)', () => {
    for (const theta of [0.3, 0.5]) {
      for (const p of [0, 3, 12]) {
        // s = 1: (1)_n/n! = 1, Σ_{n>p} θ^n = θ^(p+1)/(1 − θ)
        expect(rieszTail(theta, p, 1)).toBeCloseTo((1 + theta) * Math.pow(theta, p + 1) / (1 - theta), 14)
        // s = 2: (2)_n/n! = n + 1, Σ_{n>p} (n + 1)θ^n = θ^(p+1)((p + 2) − (p + 1)θ)/(1 − θ)²
        const closed = Math.pow(theta, p + 1) * ((p + 2) - (p + 1) * theta) / ((1 - theta) * (1 - theta))
        expect(rieszTail(theta, p, 2) / ((1 + theta) ** 2 * closed)).toBeCloseTo(1, 12)
      }
    }
    expect(logPairTail(0.5, 9)).toBeCloseTo(Math.pow(0.5, 10) / 5, 15)
  })
})

describe('tree code energies within the stated bound', () => {
  const cases: Array<[string, Float64Array, number, Kernel, Geometry]> = [
    ['coulomb, uniform cube', uniform(1200, 3, 1), 3, { name: 'coulomb' }, free3],
    ['coulomb, clustered', clustered(1200, 3, 2), 3, { name: 'coulomb' }, free3],
    ['riesz s = 0.5 on the sphere', sphere(1200, 3), 3, { name: 'riesz', s: 0.5 }, { kind: 'sphere' }],
    ['riesz s = 2.5, cubic lattice', lattice(1000, 3, 0.1), 3, { name: 'riesz', s: 2.5 }, free3],
    ['log on the sphere (chordal)', sphere(1200, 4), 3, { name: 'log' }, { kind: 'sphere' }],
    ['riesz s = 1 in the plane (embedded in R³)', uniform(1200, 2, 5), 2, { name: 'riesz', s: 1 }, { kind: 'free', d: 2 }],
  ]
  for (const [name, points, d, kernel, geometry] of cases) {
    it(`${name}: error ≤ bound ≤ tolerance at 1e−4 and 1e−6`, () => {
      const exact = wasmPairSum(points, d, kernel, geometry)
      for (const tolerance of [1e-4, 1e-6]) {
        const r = treecodeEnergy(points, d, kernel, geometry, { tolerance })
        const err = relErr(r.value, exact)
        expect(r.errorBound).toBeLessThanOrEqual(tolerance)
        expect(err).toBeLessThanOrEqual(r.errorBound + 1e-14)
        expect(r.parameters.interactions).toBeGreaterThan(0)
      }
    }, 30_000)
  }

  it('3-D Coulomb (fmm3d) at 1e−8 on clustered points', () => {
    const points = clustered(700, 3, 11)
    const r = fmm3dEnergy(points, { tolerance: 1e-8 })
    expect(relErr(r.value, pairSum({ N: 700, d: 3, points }, { name: 'coulomb' }, free3))).toBeLessThanOrEqual(1e-8)
  }, 30_000)
})

describe('tree code potentials and forces', () => {
  it('3-D Coulomb potentials within the relative bound, forces close to the direct ones', () => {
    const points = uniform(1000, 3, 6)
    const f = fmm3dFields(points, { tolerance: 1e-6 })
    const ref = directFields(points, 3, { name: 'coulomb' })
    let fmax = 0
    for (const v of ref.force) fmax = Math.max(fmax, Math.abs(v))
    for (let i = 0; i < 1000; i++) expect(relErr(f.potential[i], ref.potential[i])).toBeLessThanOrEqual(f.potentialErrorBound)
    for (let k = 0; k < 3000; k++) expect(Math.abs(f.force[k] - ref.force[k])).toBeLessThanOrEqual(1e-4 * fmax)
  }, 30_000)

  it('forces are minus the gradient of the energy (central finite differences), riesz s = 1.5', () => {
    const N = 200
    const points = uniform(N, 3, 7)
    const kernel: Kernel = { name: 'riesz', s: 1.5 }
    const f = treecodeFields(points, 3, kernel, free3, { tolerance: 1e-10, leafSize: 4 })
    const h = 1e-5
    for (const i of [0, 99, 199]) {
      for (const k of [0, 1, 2]) {
        const plus = points.slice()
        const minus = points.slice()
        plus[3 * i + k] += h
        minus[3 * i + k] -= h
        const fd = -(pairSum({ N, d: 3, points: plus }, kernel, free3) - pairSum({ N, d: 3, points: minus }, kernel, free3)) / (2 * h)
        expect(Math.abs(f.force[3 * i + k] - fd)).toBeLessThanOrEqual(1e-5 * Math.max(1, Math.abs(fd)))
      }
    }
  }, 30_000)

  it('names coincident points and rejects bad options', () => {
    const points = uniform(300, 3, 8)
    points.copyWithin(3 * 250, 3 * 4, 3 * 5)
    expect(() => treecodeEnergy(points, 3, { name: 'coulomb' }, free3, { order: 4 })).toThrow(/points 4 and 250 coincide/)
    expect(() => treecodeEnergy(uniform(10, 3, 1), 3, { name: 'coulomb' }, free3, { theta: 0 })).toThrow(EngineInputError)
    expect(() => treecodeEnergy(uniform(10, 3, 1), 3, { name: 'coulomb' }, { kind: 'torus', d: 3, L: 1 })).toThrow(EngineInputError)
  })
})
