// Turning command-line options into the engine's geometry, kernel, potential and convention.
import type { Geometry, Kernel } from '../shared/physics/types'
import type { Potential } from '../shared/physics/potentials/types'
import { presetPotential } from '../shared/physics/potentials/presets'
import { parsePotential } from '../shared/physics/potentials/expression'
import { withRecognisedPreset } from '../shared/physics/potentials/recognise'
import { CANONICAL_CONVENTION, validateConvention } from '../shared/physics/conventions'
import type { EnergyConvention } from '../shared/physics/conventions'
import type { EtaRule } from '../shared/physics/electric'
import type { OptionSpec, OptionValues } from './command'
import { UsageError } from './command'

export const geometryOptions: OptionSpec[] = [
  { name: 'geometry', type: 'string', description: 'free | torus | sphere', default: 'free' },
  { name: 'dim', type: 'number', description: 'dimension d of free space or the torus (1, 2, 3); taken from the file when left out' },
  { name: 'box', type: 'number', description: 'side L of the periodic box (torus only)' },
  { name: 'kernel', type: 'string', description: 'log | coulomb | riesz (default: log in d ≤ 2 and on the sphere, coulomb in d = 3)' },
  { name: 's', type: 'number', description: 'Riesz exponent s > 0 (kernel riesz)' },
]

export const potentialOptions: OptionSpec[] = [
  { name: 'potential', type: 'string', description: 'external potential V as an expression in x, y, z and r = |x|, e.g. "r^2" or "x^4/4 - x^2"' },
  { name: 'preset', type: 'string', description: 'instead of --potential: quadratic | quartic | double-well | radial-power' },
  { name: 'a', type: 'number', description: 'preset parameter a (quadratic a|x|², quartic a|x|²+b|x|⁴, double well b|x|⁴−a|x|², radial power a|x|^p)', default: 1 },
  { name: 'b', type: 'number', description: 'preset parameter b', default: 1 },
  { name: 'p', type: 'number', description: 'preset parameter p (radial power)', default: 2 },
]

export const conventionOption: OptionSpec = {
  name: 'convention',
  type: 'string',
  description: 'convention record as JSON, e.g. \'{"pairs":"half","fieldScale":1,"logSign":"minus-log","gibbs":"beta"}\' (default: canonical)',
}

export function stringOption(args: OptionValues, name: string): string | undefined {
  const v = args[name]
  return v === undefined ? undefined : String(v)
}

export function numberOption(args: OptionValues, name: string): number | undefined {
  const v = args[name]
  if (v === undefined) return undefined
  const n = typeof v === 'number' ? v : Number(v)
  if (!Number.isFinite(n)) throw new UsageError(`--${name} needs a number (got "${v}")`)
  return n
}

export function requireString(args: OptionValues, name: string): string {
  const v = stringOption(args, name)
  if (v === undefined || v === '') throw new UsageError(`--${name} is required`)
  return v
}

export function requireNumber(args: OptionValues, name: string): number {
  const v = numberOption(args, name)
  if (v === undefined) throw new UsageError(`--${name} is required`)
  return v
}

export function readGeometry(args: OptionValues, fileDimension?: number): Geometry {
  const kind = stringOption(args, 'geometry') ?? 'free'
  if (kind === 'sphere') return { kind: 'sphere' }
  const d = numberOption(args, 'dim') ?? fileDimension
  if (d !== 1 && d !== 2 && d !== 3) throw new UsageError(`--dim must be 1, 2 or 3 (got ${d ?? 'nothing'})`)
  if (kind === 'free') return { kind: 'free', d }
  if (kind === 'torus') {
    const L = requireNumber(args, 'box')
    if (!(L > 0)) throw new UsageError('--box must be a positive side length')
    return { kind: 'torus', d, L }
  }
  throw new UsageError(`--geometry must be free, torus or sphere (got "${kind}")`)
}

export function pointDimension(geometry: Geometry): number {
  return geometry.kind === 'sphere' ? 3 : geometry.d
}

export function readKernel(args: OptionValues, geometry: Geometry): Kernel {
  const d = pointDimension(geometry)
  const name = stringOption(args, 'kernel') ?? (geometry.kind !== 'sphere' && d === 3 ? 'coulomb' : 'log')
  if (name === 'log') return { name: 'log' }
  if (name === 'coulomb') return { name: 'coulomb' }
  if (name === 'riesz') {
    const s = requireNumber(args, 's')
    if (!(s > 0)) throw new UsageError('--s must be > 0')
    return { name: 'riesz', s }
  }
  throw new UsageError(`--kernel must be log, coulomb or riesz (got "${name}")`)
}

/** The potential named by --potential or --preset, or undefined when neither is given. */
export function readPotential(args: OptionValues, d: number): Potential | undefined {
  const text = stringOption(args, 'potential')
  const preset = stringOption(args, 'preset')
  if (text && preset) throw new UsageError('give either --potential or --preset, not both')
  const a = numberOption(args, 'a') ?? 1
  const b = numberOption(args, 'b') ?? 1
  const p = numberOption(args, 'p') ?? 2
  if (preset === 'quadratic') return presetPotential({ name: 'quadratic', a }, d)
  if (preset === 'quartic') return presetPotential({ name: 'quartic', a, b }, d)
  if (preset === 'double-well') return presetPotential({ name: 'double-well', a, b }, d)
  if (preset === 'radial-power') return presetPotential({ name: 'radial-power', a, p }, d)
  if (preset) throw new UsageError(`--preset must be quadratic, quartic, double-well or radial-power (got "${preset}")`)
  if (!text) return undefined
  return withRecognisedPreset(parsePotential(text, { d }))
}

export function readConvention(args: OptionValues, name = 'convention'): EnergyConvention {
  const text = stringOption(args, name)
  if (!text) return CANONICAL_CONVENTION
  let value: unknown
  try {
    value = JSON.parse(text)
  }
  catch {
    throw new UsageError(`--${name} must be a JSON object such as {"pairs":"half","fieldScale":1,"logSign":"minus-log","gibbs":"beta"}`)
  }
  return validateConvention(value, `--${name}`)
}

/** η rules written fixed:η, scaled:factor or nn-capped, separated by commas. */
export function readEtaRules(args: OptionValues): EtaRule[] {
  const text = stringOption(args, 'eta')
  if (!text) return [{ kind: 'nn-capped' }]
  return text.split(',').map((part) => {
    const [kind, value] = part.trim().split(':')
    if (kind === 'nn-capped') return { kind: 'nn-capped' }
    const x = Number(value)
    if (!(x > 0)) throw new UsageError(`η rule "${part}": the number after the colon must be > 0`)
    if (kind === 'fixed') return { kind: 'fixed', eta: x }
    if (kind === 'scaled') return { kind: 'scaled', factor: x }
    throw new UsageError(`η rule "${part}" must be fixed:η, scaled:factor or nn-capped`)
  })
}
