// The partition-function estimator against exact values — Mehta's integral: log Z(β₁) − log Z(β₀) for the
// Gaussian β-ensemble estimated by thermodynamic integration over MCMC energy means, compared with
// the exact difference from Mehta's integral (Mehta, Random Matrices, 3rd ed. 2004).
import { describe, expect, it } from 'vitest'
import { gaussianLogZ, ginibreLogZ } from '../../shared/physics/partition/exact'
import { logGamma } from '../../shared/physics/partition/log-gamma'
import { thermodynamicIntegration } from '../../shared/physics/partition/thermodynamic-integration'
import { quadraticPotential } from '../../shared/physics/potentials/presets'
import { createRng } from '../../shared/physics/random'
import { integratedAutocorrelation, runMcmc } from '../../shared/physics/samplers/mcmc'

describe('thermodynamic integration over MCMC means', () => {
  it('reproduces the exact Gaussian β-ensemble log Z difference within its error bar (N = 3, β from 1 to 3)', () => {
    const N = 3
    const a = 1
    const potential = quadraticPotential(a, 1)
    let call = 0
    const meanEnergy = (beta: number) => {
      const run = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 1 }, potential, beta },
        N,
        method: 'mala',
        sweeps: 12_000,
        burnIn: 1_000,
        thin: 0,
      }, { rng: createRng(`ti-${call++}`) })
      const ac = integratedAutocorrelation(run.trace)
      return { mean: ac.mean, stderr: ac.standardError }
    }
    const estimate = thermodynamicIntegration(meanEnergy, 1, 3, { nodes: 6 })
    const exact = gaussianLogZ(N, 3, a) - gaussianLogZ(N, 1, a)
    // Four standard errors of the propagated MCMC error (seeded, so the outcome is fixed).
    expect(estimate.error).toBeGreaterThan(0)
    expect(Math.abs(estimate.difference - exact)).toBeLessThan(4 * estimate.error)
    // And the error bar is informative: well below the size of the difference itself.
    expect(estimate.error).toBeLessThan(0.05 * Math.abs(exact))
  })
})

describe('thermodynamic integration from Ginibre\'s exact value', () => {
  it('carries the β = 2 plasma (Ginibre 1965) to β = 4 at N = 2 and matches the closed form there', () => {
    // N = 2 points in the plane, V = |x|², canonical weight e^{−βH/2} = |x₁ − x₂|^β e^{−β(|x₁|² + |x₂|²)}.
    // With u = (x₁ + x₂)/√2, w = (x₁ − x₂)/√2 (Jacobian 1) the integral factorises (common practice):
    // Z(β) = (π/β) · 2^{β/2} · 2π ∫₀^∞ r^{β+1} e^{−βr²} dr = π² 2^{β/2} Γ(β/2 + 1) / β^{β/2+2}.
    const closed = (beta: number) => 2 * Math.log(Math.PI) + (beta / 2) * Math.log(2) + logGamma(beta / 2 + 1) - (beta / 2 + 2) * Math.log(beta)
    // The engine's exact Ginibre value is the same number at β = 2.
    expect(ginibreLogZ(2, 1)).toBeCloseTo(closed(2), 12)
    const potential = quadraticPotential(1, 2)
    let call = 0
    const estimate = thermodynamicIntegration((beta: number) => {
      const run = runMcmc({
        model: { kernel: { name: 'log' }, geometry: { kind: 'free', d: 2 }, potential, beta },
        N: 2,
        method: 'mala',
        sweeps: 20_000,
        burnIn: 1_000,
        thin: 0,
      }, { rng: createRng(`ginibre-ti-${call++}`) })
      const ac = integratedAutocorrelation(run.trace)
      return { mean: ac.mean, stderr: ac.standardError }
    }, 2, 4, { nodes: 6 })
    const carried = ginibreLogZ(2, 1) + estimate.difference
    expect(Math.abs(carried - closed(4))).toBeLessThan(4 * estimate.error)
    expect(estimate.error).toBeLessThan(0.05 * Math.abs(closed(4) - closed(2)))
  })
})
