// The partition-function estimator against Mehta's integral: log Z(β₁) − log Z(β₀) for the
// Gaussian β-ensemble estimated by thermodynamic integration over MCMC energy means, compared with
// the exact difference from Mehta's integral (MATH.md §6; Mehta, Random Matrices, 3rd ed. 2004).
import { describe, expect, it } from 'vitest'
import { gaussianLogZ } from '../../shared/physics/partition/exact'
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
