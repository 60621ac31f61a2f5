// The catalogue of quantities a computation can evaluate, generated from the engine's commands:
// each quantity is a command (with some options fixed), and its parameters are the command's
// options less those that the ensemble itself supplies (file, geometry, kernel, potential).
import type { OptionSpec, OptionValues } from './command'
import { commands } from './commands'

export interface QuantitySpec {
  id: string
  title: string
  command: string
  /** Options fixed by the quantity (e.g. which statistic). */
  fixed: OptionValues
  parameters: OptionSpec[]
  /** Evaluated configuration by configuration (progress per configuration). */
  perConfiguration: boolean
}

/** Options an ensemble supplies itself. */
export const SUPPLIED_BY_ENSEMBLE = new Set(['input', 'configuration', 'geometry', 'dim', 'box', 'kernel', 's', 'potential', 'preset', 'a', 'b', 'p', 'statistic'])

function optionsOf(name: string): OptionSpec[] {
  const command = commands.find(c => c.name === name)
  if (!command) throw new Error(`the engine has no command ${name}`)
  return command.options.filter(o => !SUPPLIED_BY_ENSEMBLE.has(o.name))
}

const statistics: Array<[string, string, string[]]> = [
  ['spacing', 'Spacing distribution (1-D, unfolded) vs the Wigner surmise', ['bins', 'smax', 'bulk', 'normalise', 'beta', 'replicates', 'method', 'level', 'seed']],
  ['nn', 'Nearest-neighbour distances', ['bins', 'rmax', 'bulk', 'window-radius', 'replicates', 'method', 'level', 'seed']],
  ['pair-correlation', 'Pair correlation g(r) with edge correction', ['bins', 'rmax', 'bulk', 'window-radius', 'edge', 'reference', 'replicates', 'method', 'level', 'seed']],
  ['structure-factor', 'Structure factor S(k)', ['bins', 'nmax', 'k', 'directions', 'replicates', 'method', 'level', 'seed']],
  ['number-variance', 'Number variance in balls', ['radii', 'centres', 'bulk', 'window-radius', 'reference', 'replicates', 'method', 'level', 'seed']],
  ['psi6', 'Bond-orientational order ψ₆ (2-D)', ['order', 'window-radius', 'per-point', 'replicates', 'method', 'level', 'seed']],
  ['voronoi', 'Voronoi cell areas (2-D)', ['bins', 'window-radius', 'normalise', 'per-point', 'replicates', 'method', 'level', 'seed']],
  ['density', 'Empirical density vs the equilibrium density', ['bins', 'replicates', 'method', 'level', 'seed']],
  ['linear', 'Fluctuations of a linear statistic Σ f(x_i) − N ∫ f dμ_V', ['f', 'mean', 'beta', 'replicates', 'method', 'level', 'seed']],
]

export const catalogue: QuantitySpec[] = [
  { id: 'energy', title: 'Energy H_N, pair sum and confinement', command: 'energy', fixed: {}, parameters: optionsOf('energy'), perConfiguration: true },
  { id: 'next-order', title: 'Next-order energy F_N, splitting residual and electric energy', command: 'next-order', fixed: {}, parameters: optionsOf('next-order'), perConfiguration: true },
  {
    id: 'partition',
    title: 'log Z: exact for the Gaussian β-ensemble and the β = 2 plasma, with the large-N expansion',
    command: 'logz',
    fixed: {},
    parameters: optionsOf('logz').filter(o => o.name === 'ensemble' || o.name === 'expansion'),
    perConfiguration: true,
  },
  ...statistics.map(([statistic, title, keep]) => ({
    id: `statistic:${statistic}`,
    title,
    command: 'stats',
    fixed: { statistic },
    parameters: optionsOf('stats').filter(o => keep.includes(o.name)),
    perConfiguration: false,
  })),
]

export function findQuantity(id: string): QuantitySpec | undefined {
  return catalogue.find(q => q.id === id)
}

/** Checks parameter values against a quantity's option types; returns them typed, or a list of problems. */
export function checkParameters(spec: QuantitySpec, values: Record<string, unknown>): { ok: true, values: OptionValues } | { ok: false, problems: Record<string, string> } {
  const problems: Record<string, string> = {}
  const out: OptionValues = {}
  for (const [name, value] of Object.entries(values)) {
    const option = spec.parameters.find(o => o.name === name)
    if (!option) {
      problems[name] = `${spec.id} has no parameter "${name}"`
      continue
    }
    if (value === '' || value === null || value === undefined) continue
    if (option.type === 'number' && (typeof value !== 'number' || !Number.isFinite(value))) problems[name] = `${name} must be a number`
    else if (option.type === 'boolean' && typeof value !== 'boolean') problems[name] = `${name} must be true or false`
    else if (option.type === 'string' && (typeof value !== 'string' || value.length > 500)) problems[name] = `${name} must be text of at most 500 characters`
    else out[name] = value as string | number | boolean
  }
  return Object.keys(problems).length ? { ok: false, problems } : { ok: true, values: out }
}
