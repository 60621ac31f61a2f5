// convert: an energy (and optionally β) from one convention record to another.
import { convertBeta, convertEnergy, conventionLabel } from '../../shared/physics/conventions'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { numberOption, readConvention, requireNumber } from '../setting'

export const command: EngineCommand = {
  name: 'convert',
  summary: 'convert an energy (and β) between two convention records',
  options: [
    { name: 'from', type: 'string', description: 'convention record of the value, as JSON (default: canonical)' },
    { name: 'to', type: 'string', description: 'convention record wanted, as JSON (default: canonical)' },
    { name: 'value', type: 'number', description: 'the energy in the --from convention' },
    { name: 'N', type: 'number', description: 'number of points' },
    { name: 'd', type: 'number', description: 'dimension (2 on the sphere)' },
    { name: 'pair-sum', type: 'number', description: 'Σ_{i<j} g, needed when the field scalings differ' },
    { name: 'confinement', type: 'number', description: 'Σ_i V(x_i), needed when the field scalings differ' },
    { name: 'beta', type: 'number', description: 'also convert this β so that the Gibbs measure stays the same' },
  ],
  async run(args) {
    const from = readConvention(args, 'from')
    const to = readConvention(args, 'to')
    const N = requireNumber(args, 'N')
    const d = requireNumber(args, 'd')
    const value = requireNumber(args, 'value')
    const context = { N, d, pairSum: numberOption(args, 'pair-sum'), confinement: numberOption(args, 'confinement') }
    const beta = numberOption(args, 'beta')
    return {
      engineVersion: ENGINE_VERSION,
      from: { record: from, label: conventionLabel(from, { name: 'log' }, d) },
      to: { record: to, label: conventionLabel(to, { name: 'log' }, d) },
      value: convertEnergy(value, from, to, context),
      beta: beta === undefined ? undefined : convertBeta(beta, from, to, { N, d }),
    }
  },
}
