// sample: seeded samples of log-gases and Coulomb/Riesz gases — exact (β-Hermite, β-Laguerre, Ginibre)
// or by MCMC (Metropolis, MALA) — written to a CSV, JSON or NPY file.
import { createRng, rngFromState } from '../../shared/physics/random'
import type { Rng } from '../../shared/physics/random'
import { sampleBetaHermite, sampleBetaLaguerre } from '../../shared/physics/samplers/beta-ensembles'
import type { ExactSample } from '../../shared/physics/samplers/beta-ensembles'
import { sampleGinibre } from '../../shared/physics/samplers/ginibre'
import { runMcmc } from '../../shared/physics/samplers/mcmc'
import type { McmcMethod, McmcState } from '../../shared/physics/samplers/mcmc'
import { readEnsemble, writeCsv, writeJson, writeNpy } from '../../shared/physics/formats'
import type { LabelValue, PointEnsemble } from '../../shared/physics/formats'
import type { Configuration } from '../../shared/physics/types'
import { CANONICAL_CONVENTION, conventionLabel } from '../../shared/physics/conventions'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand, EngineIO, OptionValues } from '../command'
import { UsageError } from '../command'
import { geometryOptions, numberOption, pointDimension, potentialOptions, readGeometry, readKernel, readPotential, requireNumber, stringOption } from '../setting'

const KINDS = ['gue', 'beta-hermite', 'beta-laguerre', 'ginibre', 'mcmc'] as const
type Kind = typeof KINDS[number]

/** A seed from the command line: an integer text is the number, anything else the string. */
export function parseSeed(text: string | undefined): number | string {
  if (text === undefined || text === '') return 1
  return /^-?\d{1,15}$/.test(text) ? Number(text) : text
}

function positiveInteger(args: OptionValues, name: string, fallback?: number): number {
  const v = numberOption(args, name) ?? fallback
  if (v === undefined) throw new UsageError(`--${name} is required`)
  if (!Number.isInteger(v) || v < 0) throw new UsageError(`--${name} must be a whole number ≥ 0 (got ${v})`)
  return v
}

/** Encodes an ensemble by the extension of the output path (.csv, .json or .npy). */
export function encodeEnsemble(path: string, ensemble: PointEnsemble): Uint8Array {
  const lower = path.toLowerCase()
  if (lower.endsWith('.npy')) return writeNpy(ensemble)
  if (lower.endsWith('.json')) return new TextEncoder().encode(writeJson(ensemble))
  if (lower.endsWith('.csv')) return new TextEncoder().encode(writeCsv(ensemble))
  throw new UsageError(`--output must end in .csv, .json or .npy (got "${path}")`)
}

function writeOutput(io: EngineIO, path: string | undefined, d: number, configurations: Configuration[], labels: Array<Record<string, LabelValue>>): string | undefined {
  if (path === undefined) return undefined
  if (configurations.length === 0) throw new UsageError('no configuration was kept (raise --count or lower --thin)')
  const format = path.toLowerCase().endsWith('.npy') ? 'npy' : path.toLowerCase().endsWith('.json') ? 'json' : 'text'
  io.writeFile(path, encodeEnsemble(path, { d, configurations, labels, format, warnings: [] }))
  return path
}

function readState(io: EngineIO, path: string): McmcState {
  const text = new TextDecoder().decode(io.readFile(path))
  let value: unknown
  try {
    value = JSON.parse(text)
  }
  catch {
    throw new UsageError(`--resume: ${path} is not a JSON chain state`)
  }
  const s = value as McmcState
  rngFromState(s.rng) // checks the generator part
  return s
}

export const command: EngineCommand = {
  name: 'sample',
  summary: 'seeded samples: exact β-ensembles and Ginibre, or MCMC (Metropolis, MALA) for any β, kernel, potential and geometry',
  options: [
    { name: 'kind', type: 'string', description: 'gue | beta-hermite | beta-laguerre | ginibre | mcmc', default: 'beta-hermite' },
    { name: 'n', type: 'number', description: 'number of points N' },
    { name: 'beta', type: 'number', description: 'inverse temperature β (weight e^{−βH/2}, canonical convention)', default: 2 },
    { name: 'seed', type: 'string', description: 'seed of the generator (an integer or any text)', default: '1' },
    { name: 'count', type: 'number', description: 'number of configurations (MCMC: kept over the whole chain, so a resumed chain continues up to count·thin sweeps after burn-in)', default: 1 },
    { name: 'alpha', type: 'number', description: 'β-Laguerre parameter α > β(N − 1)/2' },
    ...geometryOptions,
    ...potentialOptions,
    { name: 'method', type: 'string', description: 'MCMC: metropolis | mala', default: 'metropolis' },
    { name: 'burn-in', type: 'number', description: 'MCMC: burn-in sweeps (step size adapted there only)', default: 1000 },
    { name: 'thin', type: 'number', description: 'MCMC: sweeps between kept configurations', default: 10 },
    { name: 'step', type: 'number', description: 'MCMC: initial step size' },
    { name: 'initial', type: 'string', description: 'MCMC: start from the first configuration of this file (CSV, JSON or NPY)' },
    { name: 'resume', type: 'string', description: 'MCMC: continue the chain saved in this JSON state file' },
    { name: 'state-out', type: 'string', description: 'MCMC: write the final chain state (JSON) here' },
    { name: 'output', type: 'string', description: 'write the configurations to FILE (.csv, .json or .npy)' },
  ],
  async run(args, io) {
    const kind = (stringOption(args, 'kind') ?? 'beta-hermite') as Kind
    if (!KINDS.includes(kind)) throw new UsageError(`--kind must be one of ${KINDS.join(', ')} (got "${kind}")`)
    const N = requireNumber(args, 'n')
    if (!Number.isInteger(N) || N < 1) throw new UsageError(`--n must be a whole number ≥ 1 (got ${N})`)
    const count = positiveInteger(args, 'count', 1)
    if (count < 1) throw new UsageError('--count must be at least 1')
    const seedText = stringOption(args, 'seed')
    const seed = parseSeed(seedText)
    const output = stringOption(args, 'output')
    const beta = kind === 'gue' || kind === 'ginibre' ? 2 : (numberOption(args, 'beta') ?? 2)
    if ((kind === 'gue' || kind === 'ginibre') && args.beta !== undefined && args.beta !== 2) throw new UsageError(`--kind ${kind} is the β = 2 ensemble; use beta-hermite or mcmc for other β`)

    if (kind !== 'mcmc') {
      const rng: Rng = createRng(seed)
      const samples: ExactSample[] = []
      for (let m = 0; m < count; m++) {
        if (kind === 'ginibre') samples.push(sampleGinibre({ N }, rng))
        else if (kind === 'beta-laguerre') samples.push(sampleBetaLaguerre({ N, beta, alpha: requireNumber(args, 'alpha') }, rng))
        else samples.push(sampleBetaHermite({ N, beta, a: numberOption(args, 'a') ?? 1 }, rng))
      }
      const first = samples[0]!
      const d = first.configuration.d
      const labels = samples.map((_, m) => ({ N, beta, seed, kind, index: m }))
      return {
        engineVersion: ENGINE_VERSION,
        kind,
        N,
        beta,
        count,
        seed,
        d,
        potential: first.potential,
        convention: conventionLabel(CANONICAL_CONVENTION, { name: 'log' }, d),
        output: writeOutput(io, output, d, samples.map(s => s.configuration), labels),
        configurations: output === undefined ? samples.map(s => Array.from(s.configuration.points)) : undefined,
      }
    }

    const geometry = readGeometry(args)
    const d = pointDimension(geometry)
    const kernel = readKernel(args, geometry)
    const potential = geometry.kind === 'free' ? readPotential(args, d) : undefined
    if (geometry.kind === 'free' && potential === undefined) throw new UsageError('free space needs --potential or --preset (a confining V)')
    const method = (stringOption(args, 'method') ?? 'metropolis') as McmcMethod
    if (method !== 'metropolis' && method !== 'mala') throw new UsageError(`--method must be metropolis or mala (got "${method}")`)
    const thin = positiveInteger(args, 'thin', 10)
    if (thin < 1) throw new UsageError('--thin must be at least 1')
    const burnIn = positiveInteger(args, 'burn-in', 1000)
    const resumePath = stringOption(args, 'resume')
    const initialPath = stringOption(args, 'initial')
    let initial: Float64Array | undefined
    if (initialPath !== undefined) {
      const ensemble = readEnsemble(io.readFile(initialPath), initialPath.split('/').pop() ?? initialPath)
      const first = ensemble.configurations[0]
      if (first === undefined) throw new UsageError(`--initial: ${initialPath} holds no configuration`)
      if (first.N !== N || first.d !== d) throw new UsageError(`--initial: ${initialPath} has N = ${first.N} points of dimension ${first.d}; this run needs N = ${N}, d = ${d}`)
      initial = first.points
    }
    const options = {
      model: { kernel, geometry, potential, beta },
      N,
      method,
      sweeps: count * thin,
      burnIn,
      thin,
      stepSize: numberOption(args, 'step'),
      initial,
    }
    const result = resumePath === undefined
      ? runMcmc(options, { rng: createRng(seed) })
      : runMcmc(options, { resume: readState(io, resumePath) })
    const statePath = stringOption(args, 'state-out')
    if (statePath !== undefined) io.writeFile(statePath, new TextEncoder().encode(JSON.stringify(result.state)))
    const labels = result.keptAt.map(it => ({ N, beta, seed, kind, sweep: it }))
    const ac = result.autocorrelation
    return {
      engineVersion: ENGINE_VERSION,
      kind,
      method,
      N,
      beta,
      seed,
      d,
      geometry,
      kernel,
      potential: potential ? { text: potential.text, latex: potential.latex } : null,
      convention: conventionLabel(CANONICAL_CONVENTION, kernel, d),
      burnIn,
      thin,
      kept: result.configurations.length,
      acceptanceRate: result.acceptanceRate,
      stepSize: result.stepSize,
      energy: ac === undefined
        ? undefined
        : { mean: ac.mean, standardError: ac.standardError, variance: ac.variance, autocorrelationTime: ac.tau, window: ac.window, effectiveSampleSize: ac.effectiveSampleSize },
      output: writeOutput(io, output, d, result.configurations, labels),
      state: statePath,
    }
  },
}
