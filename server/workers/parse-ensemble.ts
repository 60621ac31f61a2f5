// Parsing an uploaded ensemble file off the request thread: reads the file from disk, opens zip
// archives (APPNOTE.TXT, the .ZIP File Format Specification) entry by entry, reads every point file
// with the engine's readers, validates it for the geometry and returns per-configuration summaries
// and a preview. Bad input never throws: it comes back as { ok: false, error: { message, where } }.
// Also the default export for a piscina worker pool.
import { readFile } from 'node:fs/promises'
import { EngineInputError, type InputLocation } from '../../shared/physics/errors'
import type { Geometry } from '../../shared/physics/types'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { LabelValue } from '../../shared/physics/formats/ensemble'
import { readStoredEnsemble } from '../../shared/physics/formats/stored'
import type { StoredFormat } from '../../shared/physics/formats/stored'
import { validateEnsemble } from '../../shared/physics/formats/validate'
import { previewPoints, summariseConfiguration, type ConfigurationSummary } from '../../shared/physics/formats/summary'

export interface ParseUploadInput {
  /** Where the uploaded bytes are on disk. */
  path: string
  /** The name the uploader gave the file (used for format detection and in messages). */
  fileName: string
  geometry: Geometry
  /** Refuse files with more configurations than this (default: no limit). */
  maxConfigurations?: number
  /** Refuse zip archives whose entries declare more uncompressed bytes in total (default 1 GiB). */
  maxUncompressedBytes?: number
  /** Refuse zip archives with more entries (default 10 000). */
  maxEntries?: number
  /** Allowed | |x| − 1 | for points on the sphere (default that of validateEnsemble). */
  sphereTolerance?: number
  /** Largest number of preview points (default 2000). */
  maxPreviewPoints?: number
}

export type UploadFormat = StoredFormat
export { DEFAULT_MAX_ENTRIES, DEFAULT_MAX_UNCOMPRESSED_BYTES, ENTRY_SEPARATOR } from '../../shared/physics/formats/stored'

export interface ParseUploadSuccess {
  ok: true
  format: UploadFormat
  d: number
  configurations: ConfigurationSummary[]
  /** One record per configuration; configurations read from a zip carry file: <entry name>. */
  labels: Array<Record<string, LabelValue>>
  warnings: string[]
  /** A subsample of the first configuration. */
  preview: { d: number, points: number[][] }
  engineVersion: string
}

export interface ParseUploadFailure {
  ok: false
  error: { message: string, where: InputLocation }
}

export type ParseUploadResult = ParseUploadSuccess | ParseUploadFailure

async function parse(input: ParseUploadInput): Promise<ParseUploadSuccess> {
  const bytes = new Uint8Array(await readFile(input.path))
  const name = input.fileName
  const { format, ensemble } = readStoredEnsemble(bytes, name, {
    check: e => validateEnsemble(e, { geometry: input.geometry, tolerance: input.sphereTolerance }),
    maxUncompressedBytes: input.maxUncompressedBytes,
    maxEntries: input.maxEntries,
  })
  const M = ensemble.configurations.length
  if (input.maxConfigurations !== undefined && M > input.maxConfigurations) {
    throw new EngineInputError(`${name}: the file holds ${M} configurations, more than the ${input.maxConfigurations} allowed`, { file: name })
  }
  const period = input.geometry.kind === 'torus' ? input.geometry.L : undefined
  const configurations: ConfigurationSummary[] = []
  for (const c of ensemble.configurations) configurations.push(await summariseConfiguration(c, { period }))
  const first = ensemble.configurations[0]
  return {
    ok: true,
    format,
    d: ensemble.d,
    configurations,
    labels: ensemble.labels.map(l => ({ ...l })),
    warnings: ensemble.warnings,
    preview: { d: ensemble.d, points: previewPoints(first, input.maxPreviewPoints ?? 2000) },
    engineVersion: ENGINE_VERSION,
  }
}

/** Reads, validates and summarises an uploaded file; bad input gives { ok: false }, I/O faults throw. */
export async function parseUpload(input: ParseUploadInput): Promise<ParseUploadResult> {
  try {
    return await parse(input)
  }
  catch (error) {
    if (error instanceof EngineInputError) return { ok: false, error: { message: error.message, where: { ...error.where } } }
    throw error
  }
}

export default parseUpload
