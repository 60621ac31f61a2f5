// energy: the pair sum, the confinement term and H_N of each configuration of a file. The pair sum is
// taken by the method the engine chooses from N, the kernel and the tolerance (shared/physics/fast/
// choose.ts): a direct sum (native, WebAssembly or TypeScript kernels) or a fast method with its
// truncation bound; each row names the method and the bound.
import { conventionLabel, energyInConvention } from '../../shared/physics/conventions'
import { confinement } from '../../shared/physics/energy'
import { fastEnergy } from '../../shared/physics/fast/choose'
import { torusEnergyOfConfiguration } from '../../shared/physics/torus/ewald'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { inputOptions, loadInput, perConfiguration } from '../input'
import { conventionOption, geometryOptions, numberOption, pointDimension, potentialOptions, readConvention, readKernel, readPotential } from '../setting'

export const command: EngineCommand = {
  name: 'energy',
  summary: 'pair sum Σ_{i<j} g, confinement Σ V and H_N of each configuration, in the canonical convention and one of your choice',
  options: [
    ...inputOptions,
    ...geometryOptions,
    ...potentialOptions,
    conventionOption,
    { name: 'tolerance', type: 'number', description: 'relative error allowed in the pair sum, which lets a fast method replace the direct sum for large N', default: 1e-10 },
  ],
  async run(args, io) {
    const input = await loadInput(args, io)
    const { geometry, ensemble } = input
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    const convention = readConvention(args)
    const tolerance = numberOption(args, 'tolerance') ?? 1e-10
    if (!(tolerance > 0 && tolerance < 1)) throw new UsageError(`--tolerance must be in (0, 1) (got ${tolerance})`)
    const rows = input.selected.map((k) => {
      const conf = ensemble.configurations[k]!
      if (geometry.kind === 'torus') {
        if (kernel.name === 'riesz') throw new UsageError('torus energies are computed for the log (d = 2) and coulomb (d = 3) kernels')
        const t = torusEnergyOfConfiguration(conf, geometry.L)
        return { N: conf.N, d: conf.d, torusEnergy: t.value, selfImageConstant: t.c0, errorEstimate: t.errorEstimate, ewald: t.parameters }
      }
      const sum = fastEnergy(conf.points, conf.d, kernel, geometry, { tolerance })
      const pairs = sum.value
      const conf1 = potential ? confinement(conf, potential) : 0
      const parts = { pairSumOrdered: 2 * pairs, confinement: conf1, N: conf.N, d: conf.d, kernel }
      return {
        N: conf.N,
        d: conf.d,
        pairSum: pairs,
        confinement: conf1,
        H: energyInConvention(parts),
        Hconv: energyInConvention(parts, convention),
        method: sum.method,
        errorBound: sum.errorBound,
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
