// stats: statistics of the configurations of a file with bootstrap error bars across configurations —
// spacings, nearest neighbours, g(r), S(k), number variance, ψ₆, Voronoi areas, density, linear statistics.
import { equilibriumMeasure } from '../../shared/physics/equilibrium'
import type { EquilibriumMeasure } from '../../shared/physics/equilibrium'
import { parsePotential } from '../../shared/physics/potentials/expression'
import { createRng } from '../../shared/physics/random'
import { bondOrientationalOrder } from '../../shared/physics/statistics/bond-order'
import { empiricalDensity } from '../../shared/physics/statistics/density'
import { linearStatistic } from '../../shared/physics/statistics/linear-statistics'
import { nearestNeighbourDistribution } from '../../shared/physics/statistics/nearest-neighbour'
import { numberVariance } from '../../shared/physics/statistics/number-variance'
import { pairCorrelation } from '../../shared/physics/statistics/pair-correlation'
import { spacingDistribution } from '../../shared/physics/statistics/spacings'
import { freeStructureFactor, torusStructureFactor } from '../../shared/physics/statistics/structure-factor'
import type { ErrorBarOptions, StatisticTable } from '../../shared/physics/statistics/table'
import { voronoiCellAreas } from '../../shared/physics/statistics/voronoi'
import { bulkWindow, type Window } from '../../shared/physics/statistics/window'
import type { Configuration } from '../../shared/physics/types'
import type { EngineCommand, OptionValues } from '../command'
import { UsageError } from '../command'
import { inputOptions, loadInput } from '../input'
import { geometryOptions, numberOption, pointDimension, potentialOptions, readKernel, readPotential, stringOption } from '../setting'
import '../../shared/physics/equilibrium/solvers'

const STATISTICS = ['spacing', 'nn', 'pair-correlation', 'structure-factor', 'number-variance', 'psi6', 'voronoi', 'density', 'linear'] as const
type StatisticName = typeof STATISTICS[number]

function numberList(args: OptionValues, name: string): number[] | undefined {
  const text = stringOption(args, name)
  if (text === undefined || text === '') return undefined
  return text.split(',').map((part, k) => {
    const v = Number(part.trim())
    if (!Number.isFinite(v)) throw new UsageError(`--${name}: entry ${k + 1} ("${part.trim()}") is not a number`)
    return v
  })
}

function seedOf(text: string | undefined): number | string {
  if (text === undefined || text === '') return 1
  return /^-?\d{1,15}$/.test(text) ? Number(text) : text
}

export const command: EngineCommand = {
  name: 'stats',
  summary: 'statistics over the configurations of a file, each with a bootstrap error bar across configurations',
  options: [
    ...inputOptions,
    ...geometryOptions,
    ...potentialOptions,
    { name: 'statistic', type: 'string', description: STATISTICS.join(' | ') },
    { name: 'bins', type: 'number', description: 'number of histogram bins (default depends on the statistic)' },
    { name: 'rmax', type: 'number', description: 'largest distance (nn, pair-correlation)' },
    { name: 'smax', type: 'number', description: 'spacing: upper end of the histogram', default: 4 },
    { name: 'bulk', type: 'number', description: 'fraction of the equilibrium support used as the bulk window (spacing: fraction of the mass)', default: 0.5 },
    { name: 'window-radius', type: 'number', description: 'free space: radius of the window ball centred at the origin (instead of --bulk)' },
    { name: 'edge', type: 'string', description: 'pair-correlation edge correction: ripley | reduced-sample', default: 'ripley' },
    { name: 'reference', type: 'string', description: 'reference curve: poisson | ginibre (pair-correlation, number-variance)' },
    { name: 'radii', type: 'string', description: 'number-variance: ball radii, comma-separated' },
    { name: 'centres', type: 'number', description: 'number-variance: random centres per configuration and radius', default: 200 },
    { name: 'nmax', type: 'number', description: 'structure-factor on the torus: largest |n| of k = 2πn/L', default: 20 },
    { name: 'k', type: 'string', description: 'structure-factor in free space: |k| values, comma-separated' },
    { name: 'directions', type: 'number', description: 'structure-factor in free space: directions per |k|', default: 32 },
    { name: 'f', type: 'string', description: 'linear: the function f as an expression in x, y, z and r, e.g. "x^2"' },
    { name: 'mean', type: 'number', description: 'linear: ∫ f dμ when no equilibrium measure is available' },
    { name: 'beta', type: 'number', description: 'β of the sample (spacing: Wigner surmise; linear: Johansson\'s limit)' },
    { name: 'order', type: 'number', description: 'psi6: symmetry order', default: 6 },
    { name: 'normalise', type: 'boolean', description: 'spacing: divide by the sample mean; voronoi: areas in units of the mean area', default: false },
    { name: 'per-point', type: 'boolean', description: 'psi6: one row per point; voronoi: one row per cell', default: false },
    { name: 'replicates', type: 'number', description: 'bootstrap resamples', default: 200 },
    { name: 'method', type: 'string', description: 'bootstrap interval: standard-error | percentile', default: 'standard-error' },
    { name: 'level', type: 'number', description: 'coverage of the bootstrap interval', default: 0.6827 },
    { name: 'seed', type: 'string', description: 'seed of the resampling (and of the random centres)', default: '1' },
  ],
  async run(args, io) {
    const statistic = stringOption(args, 'statistic') as StatisticName | undefined
    if (statistic === undefined || !STATISTICS.includes(statistic)) throw new UsageError(`--statistic must be one of ${STATISTICS.join(', ')} (got "${statistic ?? ''}")`)
    const input = await loadInput(args, io)
    const { geometry, ensemble } = input
    if (geometry.kind === 'sphere') throw new UsageError('stats: points on the sphere are not supported yet (free space or torus)')
    const d = pointDimension(geometry)
    const configs: Configuration[] = input.selected.map(k => ensemble.configurations[k])
    const rng = createRng(seedOf(stringOption(args, 'seed')))
    const method = stringOption(args, 'method') ?? 'standard-error'
    if (method !== 'standard-error' && method !== 'percentile') throw new UsageError(`--method must be standard-error or percentile (got "${method}")`)
    const errorBars: ErrorBarOptions = {
      uniform: () => rng.uniform(),
      replicates: numberOption(args, 'replicates') ?? 200,
      method,
      level: numberOption(args, 'level') ?? 0.6827,
    }
    const bins = numberOption(args, 'bins')
    const bulk = numberOption(args, 'bulk') ?? 0.5
    const radius = numberOption(args, 'window-radius')
    const reference = stringOption(args, 'reference')
    if (reference !== undefined && reference !== 'poisson' && reference !== 'ginibre') throw new UsageError(`--reference must be poisson or ginibre (got "${reference}")`)

    let measureCache: EquilibriumMeasure | undefined
    const measure = (): EquilibriumMeasure => {
      if (measureCache) return measureCache
      const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
      if (geometry.kind === 'free' && potential === undefined) throw new UsageError(`--statistic ${statistic} needs the equilibrium measure: give --potential or --preset${['spacing', 'density', 'linear'].includes(statistic) ? '' : ' (or a window with --window-radius)'}`)
      measureCache = equilibriumMeasure({ d, kernel: readKernel(args, geometry), potential, geometry })
      return measureCache
    }
    const window = (): Window => {
      if (geometry.kind === 'torus') return { kind: 'torus', L: geometry.L }
      if (radius !== undefined) {
        if (!(radius > 0)) throw new UsageError('--window-radius must be > 0')
        return { kind: 'ball', center: new Array<number>(d).fill(0), radius }
      }
      return bulkWindow(measure(), bulk)
    }
    const beta = numberOption(args, 'beta')
    let table: StatisticTable
    switch (statistic) {
      case 'spacing':
        table = spacingDistribution(configs, { ...errorBars, measure: measure(), bulkFraction: bulk, bins, smax: numberOption(args, 'smax'), normalise: args.normalise === true ? 'mean' : 'none', beta })
        break
      case 'nn':
        table = nearestNeighbourDistribution(configs, { ...errorBars, window: window(), bins, rmax: numberOption(args, 'rmax') })
        break
      case 'pair-correlation': {
        const edge = stringOption(args, 'edge') ?? 'ripley'
        if (edge !== 'ripley' && edge !== 'reduced-sample') throw new UsageError(`--edge must be ripley or reduced-sample (got "${edge}")`)
        table = pairCorrelation(configs, { ...errorBars, window: window(), bins, rmax: numberOption(args, 'rmax'), edge, reference })
        break
      }
      case 'structure-factor':
        if (geometry.kind === 'torus') table = torusStructureFactor(configs, { ...errorBars, L: geometry.L, nmax: numberOption(args, 'nmax'), bins })
        else {
          const k = numberList(args, 'k')
          if (!k) throw new UsageError('--statistic structure-factor in free space needs --k (comma-separated |k| values)')
          table = freeStructureFactor(configs, { ...errorBars, k, directions: numberOption(args, 'directions') })
        }
        break
      case 'number-variance': {
        const radii = numberList(args, 'radii')
        if (!radii) throw new UsageError('--statistic number-variance needs --radii (comma-separated)')
        table = numberVariance(configs, { ...errorBars, window: window(), radii, centres: numberOption(args, 'centres'), reference })
        break
      }
      case 'psi6':
        table = bondOrientationalOrder(configs, { ...errorBars, window: geometry.kind === 'torus' || radius !== undefined ? window() : undefined, order: numberOption(args, 'order'), perPoint: args['per-point'] === true })
        break
      case 'voronoi':
        table = voronoiCellAreas(configs, { ...errorBars, window: geometry.kind === 'torus' || radius !== undefined ? window() : undefined, bins, normalise: args.normalise === true, perCell: args['per-point'] === true })
        break
      case 'density':
        table = empiricalDensity(configs, { ...errorBars, measure: measure(), bins })
        break
      case 'linear': {
        const text = stringOption(args, 'f')
        if (!text) throw new UsageError('--statistic linear needs --f (an expression in x, y, z, r)')
        const f = parsePotential(text, { d })
        const mean = numberOption(args, 'mean')
        table = linearStatistic(configs, { ...errorBars, f: x => f.value(x, 0), label: f.text, mean, measure: mean === undefined ? measure() : undefined, beta })
        break
      }
    }
    return {
      ...table,
      rejected: table.rejected.map(r => ({ ...r, configuration: input.selected[r.configuration] })),
      input: input.path,
      inputSha256: input.sha256,
      geometry,
      selected: input.selected,
      seed: seedOf(stringOption(args, 'seed')),
    }
  },
}
