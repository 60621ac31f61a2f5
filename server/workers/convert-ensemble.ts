// Writing a stored ensemble (or one of its configurations) in another format, off the request
// thread. Also the default export for a piscina worker pool.
import { EngineInputError } from '../../shared/physics/errors'
import type { PointEnsemble } from '../../shared/physics/formats/ensemble'
import { readStoredEnsemble } from '../../shared/physics/formats/stored'
import { writeNpy } from '../../shared/physics/formats/npy'
import { writeCsv, writeJson } from '../../shared/physics/formats/write'

export interface ConvertInput {
  bytes: Uint8Array
  fileName: string
  format: 'csv' | 'json' | 'npy'
  /** Only this configuration (0-based); every one when left out. */
  configuration?: number
}

export type ConvertResult = { ok: true, bytes: Uint8Array } | { ok: false, message: string }

export function convertEnsemble(input: ConvertInput): ConvertResult {
  try {
    const { ensemble } = readStoredEnsemble(input.bytes, input.fileName)
    let chosen: PointEnsemble = ensemble
    if (input.configuration !== undefined) {
      const c = ensemble.configurations[input.configuration]
      if (!c) return { ok: false, message: `there is no configuration ${input.configuration}` }
      chosen = { ...ensemble, configurations: [c], labels: [ensemble.labels[input.configuration] ?? {}] }
    }
    if (input.format === 'npy') return { ok: true, bytes: writeNpy(chosen) }
    const text = input.format === 'csv' ? writeCsv(chosen) : writeJson(chosen)
    return { ok: true, bytes: new TextEncoder().encode(text) }
  }
  catch (error) {
    if (error instanceof EngineInputError) return { ok: false, message: error.message }
    throw error
  }
}

export default convertEnsemble
