// equilibrium: the equilibrium measure of a kernel and a potential — support, I_V, c_V, density samples.
import { equilibriumMeasure } from '../../shared/physics/equilibrium'
import type { Support } from '../../shared/physics/equilibrium'
import { ENGINE_VERSION } from '../../shared/physics/version'
import { conventionLabel, CANONICAL_CONVENTION } from '../../shared/physics/conventions'
import type { EngineCommand } from '../command'
import { geometryOptions, numberOption, pointDimension, potentialOptions, readGeometry, readKernel, readPotential } from '../setting'
import '../../shared/physics/equilibrium/solvers'

function outerRadius(support: Support): number | undefined {
  if (support.kind === 'ball') return support.radius
  if (support.kind === 'annulus') return support.outer
  if (support.kind === 'intervals') return Math.max(...support.intervals.map(([a, b]) => Math.max(Math.abs(a), Math.abs(b))))
  return undefined
}

export const command: EngineCommand = {
  name: 'equilibrium',
  summary: 'the equilibrium measure μ_V: support, I_V, c_V, ∬ g dμ dμ and density samples along the first axis',
  options: [...geometryOptions, ...potentialOptions, { name: 'samples', type: 'number', description: 'number of density samples', default: 11 }],
  async run(args) {
    const geometry = readGeometry(args)
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    const measure = equilibriumMeasure({ d, kernel, potential, geometry })
    const R = outerRadius(measure.support)
    const samples = Math.max(2, Math.min(1000, Math.round(numberOption(args, 'samples') ?? 11)))
    const density = R === undefined
      ? []
      : Array.from({ length: samples }, (_, k) => {
          const x = new Float64Array(d)
          x[0] = (1.2 * R * k) / (samples - 1)
          return { x: x[0], density: measure.density(x, 0), potential: measure.potential(x, 0) }
        })
    return {
      engineVersion: ENGINE_VERSION,
      geometry,
      kernel,
      potential: potential ? { text: potential.text, latex: potential.latex } : null,
      convention: conventionLabel(CANONICAL_CONVENTION, kernel, d),
      method: measure.method,
      source: measure.source,
      accuracy: measure.accuracy,
      support: measure.support,
      supportRadius: measure.support.kind === 'ball' ? measure.support.radius : undefined,
      intervals: measure.support.kind === 'intervals' ? measure.support.intervals : undefined,
      selfEnergy: measure.selfEnergy,
      IV: measure.IV,
      cV: measure.cV,
      density,
    }
  },
}
