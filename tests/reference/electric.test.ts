import { describe, it, expect } from 'vitest'
import { electricEnergy } from '../../shared/physics/electric'
import { uniformBall, uniformDisk } from '../support/uniform-measures'

// One smeared charge at the centre of a uniform background of radius R is radially symmetric, so
// Gauss's law gives the field from the enclosed charge Q(r) = 1_{r>η} − min(r, R)^d/R^d:
// |∇h|(r) = Q(r)/r^{d−1}, and (1/c_d)∫|∇h|² = ∫_0^∞ Q(r)² r^{1−d} dr (Jackson, Classical
// Electrodynamics, 3rd ed. 1999, §1.3 and §1.11, field energy ∝ ∫|E|²). Integrating piecewise:
const gauss2 = (eta: number, R: number): number => eta < R
  ? eta ** 4 / (4 * R ** 4) + Math.log(R / eta) - (1 - (eta * eta) / (R * R)) + (1 - eta ** 4 / R ** 4) / 4
  : 0.25 + Math.log(eta / R)
const gauss3 = (eta: number, R: number): number => eta < R
  ? eta ** 5 / (5 * R ** 6) + (1 / eta - 1 / R) - (R * R - eta * eta) / R ** 3 + (R ** 5 - eta ** 5) / (5 * R ** 6)
  : 1 / (5 * R) + 1 / R - 1 / eta

describe('electric energy of one centred smeared charge against Gauss’s law', () => {
  it('2-D, uniform disk, η below and above R (1e-13 relative)', () => {
    for (const R of [0.5, 1, 2.2]) {
      for (const eta of [0.01, 0.3, 0.9, 1.7, 3]) {
        const res = electricEnergy({ N: 1, d: 2, points: Float64Array.from([0, 0]) }, uniformDisk(R), { rule: { kind: 'fixed', eta } })
        const expected = gauss2(eta, R)
        expect(Math.abs(res.value - expected)).toBeLessThan(1e-13 * Math.max(1, Math.abs(expected)))
      }
    }
  })
  it('3-D, uniform ball, η below and above R (1e-13 relative)', () => {
    for (const R of [0.5, 1, 2.2]) {
      for (const eta of [0.01, 0.3, 0.9, 1.7, 3]) {
        const res = electricEnergy({ N: 1, d: 3, points: Float64Array.from([0, 0, 0]) }, uniformBall(R), { rule: { kind: 'fixed', eta } })
        const expected = gauss3(eta, R)
        expect(Math.abs(res.value - expected)).toBeLessThan(1e-13 * Math.max(1, Math.abs(expected)))
      }
    }
  })
  it('the nn-capped rule with N = 1 uses η = N^(−1/d) = 1', () => {
    const res = electricEnergy({ N: 1, d: 2, points: Float64Array.from([0, 0]) }, uniformDisk(1), { rule: { kind: 'nn-capped' } })
    expect(res.etas[0]).toBe(1)
    expect(Math.abs(res.value - gauss2(1, 1))).toBeLessThan(1e-14)
  })
})
