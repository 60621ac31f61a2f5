// Reading and checking the --input file of a command.
import { sha256Hex, validateEnsemble } from '../shared/physics/formats'
import { readStoredEnsemble } from '../shared/physics/formats/stored'
import type { PointEnsemble } from '../shared/physics/formats'
import type { Geometry } from '../shared/physics/types'
import type { EngineIO, OptionValues } from './command'
import { UsageError } from './command'
import { numberOption, readGeometry, requireString } from './setting'

export interface LoadedInput {
  path: string
  ensemble: PointEnsemble
  geometry: Geometry
  sha256: string
  /** Indices of the configurations the command works on. */
  selected: number[]
}

export const inputOptions = [
  { name: 'input', type: 'string' as const, description: 'configuration file: CSV/TSV/whitespace text, JSON, NPY, or a zip of such files' },
  { name: 'configuration', type: 'number' as const, description: 'work on this configuration only (0-based); default: every one' },
]

export async function loadInput(args: OptionValues, io: EngineIO): Promise<LoadedInput> {
  const path = requireString(args, 'input')
  const bytes = io.readFile(path)
  const fileName = path.split('/').pop() ?? path
  const { ensemble } = readStoredEnsemble(bytes, fileName)
  const geometry = readGeometry(args, ensemble.d)
  validateEnsemble(ensemble, { geometry })
  const only = numberOption(args, 'configuration')
  const M = ensemble.configurations.length
  if (only !== undefined && !(Number.isInteger(only) && only >= 0 && only < M)) {
    throw new UsageError(`--configuration must be an index from 0 to ${M - 1} (the file holds ${M})`)
  }
  return {
    path,
    ensemble,
    geometry,
    sha256: await sha256Hex(bytes),
    selected: only === undefined ? ensemble.configurations.map((_, i) => i) : [only],
  }
}

/** One configuration's result flat when there is one, else a list under `configurations`. */
export function perConfiguration<T extends object>(input: LoadedInput, common: Record<string, unknown>, rows: T[]): unknown {
  const labelled = rows.map((row, k) => ({ configuration: input.selected[k], labels: input.ensemble.labels[input.selected[k]!] ?? {}, ...row }))
  if (labelled.length === 1) return { ...common, ...labelled[0], inputSha256: input.sha256 }
  return { ...common, inputSha256: input.sha256, configurations: labelled }
}
