// next-order: F_N, the splitting identity and the electric energy for η rules.
import { electricEnergy, electricGap } from '../../shared/physics/electric'
import { equilibriumMeasure } from '../../shared/physics/equilibrium'
import { nextOrderEnergy } from '../../shared/physics/nextorder'
import { ENGINE_VERSION } from '../../shared/physics/version'
import { conventionLabel, CANONICAL_CONVENTION } from '../../shared/physics/conventions'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { inputOptions, loadInput, perConfiguration } from '../input'
import { geometryOptions, numberOption, pointDimension, potentialOptions, readEtaRules, readKernel, readPotential } from '../setting'
import '../../shared/physics/equilibrium/solvers'

export const command: EngineCommand = {
  name: 'next-order',
  summary: 'next-order energy F_N against μ_V, the splitting H_N = N² I_V + 2N Σ ζ + F_N with its residual, and the electric energy',
  options: [
    ...inputOptions, ...geometryOptions, ...potentialOptions,
    { name: 'eta', type: 'string', description: 'η rules, comma-separated: fixed:η, scaled:factor (η = factor·N^(−1/d)), nn-capped (η = min(¼ r_nn, N^(−1/d)))', default: 'nn-capped' },
    { name: 'tolerance', type: 'number', description: 'relative error allowed in the pair sum, which lets a fast method replace the direct sum for large N', default: 1e-10 },
  ],
  async run(args, io) {
    const tolerance = numberOption(args, 'tolerance') ?? 1e-10
    if (!(tolerance > 0 && tolerance < 1)) throw new UsageError(`--tolerance must be in (0, 1) (got ${tolerance})`)
    const input = await loadInput(args, io)
    const { geometry, ensemble } = input
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    const measure = equilibriumMeasure({ d, kernel, potential, geometry })
    const rules = readEtaRules(args)
    const electricApplies = geometry.kind === 'free' && ((kernel.name === 'log' && d <= 2) || (kernel.name === 'coulomb' && d === 3))
    const rows = input.selected.map((k) => {
      const conf = ensemble.configurations[k]!
      const r = nextOrderEnergy(conf, { kernel, geometry, potential, measure, tolerance })
      const electric = electricApplies
        ? rules.map((rule) => {
            const e = electricEnergy(conf, measure, { rule, pairSum: r.pairSum })
            return { rule, value: e.value, overlaps: e.overlaps, lowerBound: e.lowerBound, gap: electricGap(r.nextOrder, e) }
          })
        : []
      return {
        N: r.N, d: r.d, pairSum: r.pairSum, method: r.pairMethod, errorBound: r.pairErrorBound, confinement: r.confinement, H: r.H,
        IV: r.IV, cV: r.cV, zetaSum: r.zetaSum, nextOrder: r.nextOrder,
        splittingResidual: r.splittingResidual,
        normalisedNextOrder: r.normalisedNextOrder, normalisation: r.normalisation,
        electric,
      }
    })
    return perConfiguration(input, {
      engineVersion: ENGINE_VERSION,
      geometry,
      kernel,
      potential: potential ? { text: potential.text, latex: potential.latex } : null,
      convention: conventionLabel(CANONICAL_CONVENTION, kernel, d),
      measure: { method: measure.method, source: measure.source, accuracy: measure.accuracy, support: measure.support },
      electricNote: electricApplies ? undefined : 'the electric energy is defined for the Coulomb cases: log in d = 1, 2 and coulomb in d = 3, in free space',
    }, rows)
  },
}
