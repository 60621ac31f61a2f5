// Minimal Riesz (s = 1, Thomson) and logarithmic energies of N = 2 … 6 points on S², evaluated on the
// configurations the engine constructs.
import { describe, it, expect } from 'vitest'
import {
  antipodalPair,
  assertOnSphere,
  equatorialTriangle,
  optimalSphereConfiguration,
  regularOctahedron,
  regularTetrahedron,
  sphereLogEnergy,
  sphereRieszEnergy,
  triangularBipyramid,
} from '../../shared/physics/sphere'
import { EngineInputError } from '../../shared/physics/errors'

// Thomson problem minima Σ_{i<j} 1/|x_i − x_j|: Wales, McKay & Altschuler, Phys. Rev. B 79, 224115 (2009), table.
const THOMSON: Record<number, number> = { 2: 0.5, 3: Math.sqrt(3), 4: 3.674234614, 5: 6.474691495, 6: 9.985281374 }
// Log-energy minima Σ_{i<j} log(1/|x_i − x_j|): Ridgway & Cheviakov, Comput. Phys. Commun. 233 (2018), table.
const LOG: Record<number, number> = { 2: -Math.log(2), 3: -1.5 * Math.log(3), 4: 3 * Math.log(3 / 8), 5: -4.4205071552, 6: -9 * Math.log(2) }

describe('optimal configurations on S²', () => {
  it('lie on the unit sphere and have the right sizes', () => {
    for (let N = 2; N <= 6; N++) {
      const c = optimalSphereConfiguration(N)
      expect(c.N).toBe(N)
      expect(() => assertOnSphere(c, 1e-15)).not.toThrow()
    }
    expect(() => optimalSphereConfiguration(7)).toThrow(EngineInputError)
  })

  it('reach the published Thomson minima (N = 2 … 6) to 1e−8', () => {
    for (let N = 2; N <= 6; N++) expect(Math.abs(sphereRieszEnergy(optimalSphereConfiguration(N), 1) - THOMSON[N])).toBeLessThan(1e-8)
  })

  it('reach the published log-energy minima (N = 2 … 6) to 1e−8', () => {
    for (let N = 2; N <= 6; N++) expect(Math.abs(sphereLogEnergy(optimalSphereConfiguration(N)) - LOG[N])).toBeLessThan(1e-8)
  })

  it('match the energies written from their distances (elementary geometry)', () => {
    // tetrahedron: 6 pairs at √(8/3); bipyramid: 1 pair at 2, 6 at √2, 3 at √3; octahedron: 12 at √2, 3 at 2
    expect(sphereRieszEnergy(regularTetrahedron(), 1)).toBeCloseTo(6 / Math.sqrt(8 / 3), 14)
    expect(sphereRieszEnergy(triangularBipyramid(), 1)).toBeCloseTo(0.5 + 6 / Math.SQRT2 + Math.sqrt(3), 14)
    expect(sphereLogEnergy(triangularBipyramid())).toBeCloseTo(-(4 * Math.log(2) + 1.5 * Math.log(3)), 14)
    expect(sphereRieszEnergy(regularOctahedron(), 2)).toBeCloseTo(12 / 2 + 3 / 4, 14)
    expect(sphereRieszEnergy(antipodalPair(), 0.5)).toBeCloseTo(2 ** -0.5, 15)
    expect(sphereLogEnergy(equatorialTriangle())).toBeCloseTo(-1.5 * Math.log(3), 14)
  })

  it('are local minima: small random moves on the sphere raise both energies', () => {
    let s = 12345
    const rand = (): number => {
      s = (Math.imul(s, 1664525) + 1013904223) >>> 0
      return s / 4294967296 - 0.5
    }
    for (let N = 2; N <= 6; N++) {
      const base = optimalSphereConfiguration(N)
      for (let trial = 0; trial < 20; trial++) {
        const p = Float64Array.from(base.points)
        for (let i = 0; i < N; i++) {
          let r = 0
          for (let k = 0; k < 3; k++) {
            p[3 * i + k] += 1e-3 * rand()
            r += p[3 * i + k] ** 2
          }
          for (let k = 0; k < 3; k++) p[3 * i + k] /= Math.sqrt(r)
        }
        const moved = { N, d: 3, points: p }
        expect(sphereRieszEnergy(moved, 1)).toBeGreaterThan(THOMSON[N] - 1e-9)
        expect(sphereLogEnergy(moved)).toBeGreaterThan(LOG[N] - 1e-9)
      }
    }
  })

  it('rejects points off the sphere, naming the point', () => {
    const c = regularOctahedron()
    c.points[3 * 4 + 2] = 1.01
    expect(() => sphereLogEnergy(c)).toThrow(/point 4/)
  })
})
