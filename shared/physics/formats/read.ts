// Choosing the reader for an uploaded file: the NPY magic string "\x93NUMPY" (NEP 1) first, then
// the file name's extension, then the first non-blank character ('[' or '{' means JSON).
import type { InputLocation } from '../errors'
import { EngineInputError } from '../errors'
import type { EnsembleFormat, PointEnsemble } from './ensemble'
import { readJson } from './json'
import { inputError } from './location'
import { hasNpyMagic, readNpy } from './npy'
import { readText } from './text'
import { collectProblems, type EnsembleProblem, type ValidationOptions } from './validate'

export interface ReadOptions {
  /** Force a reader instead of detecting it. */
  format?: EnsembleFormat
}

const TEXT_EXTENSIONS = new Set(['csv', 'tsv', 'txt', 'dat', 'xyz', 'tab', 'ssv'])

function extensionOf(fileName: string): string {
  const base = fileName.slice(fileName.lastIndexOf('/') + 1)
  const dot = base.lastIndexOf('.')
  return dot > 0 ? base.slice(dot + 1).toLowerCase() : ''
}

/** The reader that `readEnsemble` would use for this input. */
export function detectFormat(input: Uint8Array | string, fileName: string): EnsembleFormat {
  if (typeof input !== 'string' && hasNpyMagic(input)) return 'npy'
  const ext = extensionOf(fileName)
  if (ext === 'npy') return 'npy'
  if (ext === 'json') return 'json'
  if (TEXT_EXTENSIONS.has(ext)) return 'text'
  const n = Math.min(input.length, 4096)
  for (let i = 0; i < n; i++) {
    const c = typeof input === 'string' ? input.charCodeAt(i) : input[i]
    if (c === 32 || c === 9 || c === 10 || c === 13 || c === 0xfeff || c === 0xef || c === 0xbb || c === 0xbf) continue
    return c === 91 || c === 123 ? 'json' : 'text'
  }
  return 'text'
}

/** Reads an ensemble from CSV/TSV/whitespace text, JSON or NPY bytes. */
export function readEnsemble(input: Uint8Array | string, fileName: string, options: ReadOptions = {}): PointEnsemble {
  const format = options.format ?? detectFormat(input, fileName)
  if (format === 'npy') {
    if (typeof input === 'string') throw inputError('an NPY file is binary: pass its bytes (a Uint8Array), not a string', { file: fileName })
    if (!hasNpyMagic(input)) throw inputError('the file is named .npy but does not start with the NPY magic string \\x93NUMPY', { file: fileName, line: 1, column: 1 })
    return readNpy(input, fileName)
  }
  return format === 'json' ? readJson(input, fileName) : readText(input, fileName)
}

export interface Inspection {
  /** The ensemble as read, when the file could be read. */
  ensemble?: PointEnsemble
  /** Reading error (at most one) or validation problems (at most maxProblems). */
  problems: EnsembleProblem[]
}

/** Reads and validates in one step, never throwing for bad input: for upload screens. */
export function inspectEnsembleFile(input: Uint8Array | string, fileName: string, options: ValidationOptions & ReadOptions & { maxProblems?: number }): Inspection {
  let ensemble: PointEnsemble
  try {
    ensemble = readEnsemble(input, fileName, options)
  }
  catch (error) {
    if (!(error instanceof EngineInputError)) throw error
    const where: InputLocation = error.where
    return { problems: [{ kind: 'read', message: error.message, where }] }
  }
  return { ensemble, problems: collectProblems(ensemble, options) }
}
