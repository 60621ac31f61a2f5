// logz: exact log Z of the Gaussian β-ensemble (Mehta's integral) or of the 2-D plasma at β = 2 (Ginibre),
// in the canonical convention or any convention record, with the large-N expansion terms beside it.
import { semicircleMeasure, uniformDiskMeasure } from '../../shared/physics/equilibrium'
import { exactLogZ } from '../../shared/physics/partition/exact'
import { logZExpansion } from '../../shared/physics/partition/expansion'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { conventionOption, numberOption, readConvention, requireNumber, stringOption } from '../setting'

export const command: EngineCommand = {
  name: 'logz',
  summary: 'exact log Z of the Gaussian β-ensemble or the β = 2 plasma (V = a|x|²), in any convention, with its large-N expansion',
  options: [
    { name: 'ensemble', type: 'string', description: 'gaussian (d = 1, any β) | ginibre (d = 2, canonical β = 2)', default: 'gaussian' },
    { name: 'n', type: 'number', description: 'number of points N' },
    { name: 'beta', type: 'number', description: 'β in the chosen convention (default 2)', default: 2 },
    { name: 'a', type: 'number', description: 'V(x) = a|x|²', default: 1 },
    conventionOption,
    { name: 'expansion', type: 'boolean', description: 'also list the terms of the large-N expansion', default: true },
  ],
  async run(args) {
    const ensemble = stringOption(args, 'ensemble') ?? 'gaussian'
    if (ensemble !== 'gaussian' && ensemble !== 'ginibre') throw new UsageError(`--ensemble must be gaussian or ginibre (got "${ensemble}")`)
    const N = requireNumber(args, 'n')
    if (!Number.isInteger(N) || N < 1) throw new UsageError(`--n must be a whole number ≥ 1 (got ${N})`)
    const beta = numberOption(args, 'beta') ?? 2
    const a = numberOption(args, 'a') ?? 1
    const convention = readConvention(args)
    const exact = exactLogZ({ ensemble, N, beta, a, convention })
    const wantExpansion = args.expansion !== false && N >= 2
    const expansion = wantExpansion
      ? logZExpansion({
          d: exact.d,
          N,
          beta: exact.canonical.beta,
          measure: exact.d === 1 ? semicircleMeasure(exact.canonical.a) : uniformDiskMeasure(exact.canonical.a),
          quadraticPotential: true,
        })
      : undefined
    return {
      ...exact,
      ...(expansion
        ? {
            expansion: {
              terms: expansion.terms,
              approximation: expansion.approximation,
              remainder: expansion.remainder,
              difference: exact.logZ - expansion.approximation,
              notes: [...expansion.notes, 'the expansion is written for the canonical β and a listed under canonical'],
            },
          }
        : {}),
    }
  },
}
