// minimize: ground states (β = ∞) by L-BFGS from seeded random starts; the best configuration is
// written to a CSV, JSON or NPY file and its canonical energy reported with the spread of the restarts.
import { createRng } from '../../shared/physics/random'
import { groundState } from '../../shared/physics/minimize/ground-state'
import { CANONICAL_CONVENTION, conventionLabel } from '../../shared/physics/conventions'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { geometryOptions, numberOption, pointDimension, potentialOptions, readGeometry, readKernel, readPotential, requireNumber, stringOption } from '../setting'
import { encodeEnsemble, parseSeed } from './sample'

export const command: EngineCommand = {
  name: 'minimize',
  summary: 'ground states by L-BFGS with seeded random restarts: best energy (canonical convention) and the spread of local minima',
  options: [
    { name: 'n', type: 'number', description: 'number of points N ≥ 2' },
    ...geometryOptions,
    ...potentialOptions,
    { name: 'restarts', type: 'number', description: 'number of random starts', default: 10 },
    { name: 'seed', type: 'string', description: 'seed of the generator (an integer or any text)', default: '1' },
    { name: 'tolerance', type: 'number', description: 'stop when every gradient component is below this', default: 1e-10 },
    { name: 'output', type: 'string', description: 'write the best configuration to FILE (.csv, .json or .npy)' },
  ],
  async run(args, io) {
    const N = requireNumber(args, 'n')
    if (!Number.isInteger(N) || N < 2) throw new UsageError(`--n must be a whole number ≥ 2 (got ${N})`)
    const geometry = readGeometry(args)
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    if (geometry.kind === 'free' && potential === undefined) throw new UsageError('free space needs --potential or --preset (a confining V)')
    const restarts = numberOption(args, 'restarts') ?? 10
    if (!Number.isInteger(restarts) || restarts < 1) throw new UsageError(`--restarts must be a whole number ≥ 1 (got ${restarts})`)
    const tolerance = numberOption(args, 'tolerance') ?? 1e-10
    if (!(tolerance > 0)) throw new UsageError('--tolerance must be > 0')
    const seed = parseSeed(stringOption(args, 'seed'))
    const result = groundState({ N, kernel, geometry, potential, restarts, lbfgs: { gradientTolerance: tolerance } }, createRng(seed))
    const output = stringOption(args, 'output')
    if (output !== undefined) {
      const format = output.toLowerCase().endsWith('.npy') ? 'npy' : output.toLowerCase().endsWith('.json') ? 'json' : 'text'
      io.writeFile(output, encodeEnsemble(output, { d, configurations: [result.best], labels: [{ N, seed, energy: result.energy }], format, warnings: [] }))
    }
    return {
      engineVersion: ENGINE_VERSION,
      N,
      geometry,
      kernel,
      potential: potential ? { text: potential.text, latex: potential.latex } : null,
      convention: conventionLabel(CANONICAL_CONVENTION, kernel, d),
      energy: result.energy,
      pairSum: result.pairSum,
      parametrisation: result.parametrisation,
      restarts,
      seed,
      spread: result.spread,
      converged: result.runs.filter(r => r.converged).length,
      output,
      points: output === undefined ? Array.from(result.best.points) : undefined,
    }
  },
}
