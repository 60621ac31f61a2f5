// energy: the pair sum, the confinement term and H_N of each configuration of a file.
import { conventionLabel, energyInConvention } from '../../shared/physics/conventions'
import { pairSum, confinement } from '../../shared/physics/energy'
import { torusEnergyOfConfiguration } from '../../shared/physics/torus/ewald'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { inputOptions, loadInput, perConfiguration } from '../input'
import { conventionOption, geometryOptions, pointDimension, potentialOptions, readConvention, readKernel, readPotential } from '../setting'

export const command: EngineCommand = {
  name: 'energy',
  summary: 'pair sum Σ_{i<j} g, confinement Σ V and H_N of each configuration, in the canonical convention and one of your choice',
  options: [...inputOptions, ...geometryOptions, ...potentialOptions, conventionOption],
  async run(args, io) {
    const input = await loadInput(args, io)
    const { geometry, ensemble } = input
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    const convention = readConvention(args)
    const rows = input.selected.map((k) => {
      const conf = ensemble.configurations[k]!
      if (geometry.kind === 'torus') {
        if (kernel.name === 'riesz') throw new UsageError('torus energies are computed for the log (d = 2) and coulomb (d = 3) kernels')
        const t = torusEnergyOfConfiguration(conf, geometry.L)
        return { N: conf.N, d: conf.d, torusEnergy: t.value, selfImageConstant: t.c0, errorEstimate: t.errorEstimate, ewald: t.parameters }
      }
      const pairs = pairSum(conf, kernel, geometry)
      const conf1 = potential ? confinement(conf, potential) : 0
      const parts = { pairSumOrdered: 2 * pairs, confinement: conf1, N: conf.N, d: conf.d, kernel }
      return {
        N: conf.N,
        d: conf.d,
        pairSum: pairs,
        confinement: conf1,
        H: energyInConvention(parts),
        Hconv: energyInConvention(parts, convention),
      }
    })
    return perConfiguration(input, {
      engineVersion: ENGINE_VERSION,
      geometry,
      kernel,
      potential: potential ? { text: potential.text, latex: potential.latex } : null,
      convention: { canonical: conventionLabel(readConvention({}), kernel, d), chosen: convention, chosenLabel: conventionLabel(convention, kernel, d) },
    }, rows)
  },
}
