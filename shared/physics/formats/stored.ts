// Reading a stored ensemble file of any accepted kind: one point file (text, JSON, NPY) or a zip
// archive of several (APPNOTE.TXT, the .ZIP File Format Specification), entry by entry, with
// limits against archives that would expand without bound. Pure TypeScript (fflate is pure JS).
import { unzipSync } from 'fflate'
import { EngineInputError } from '../errors'
import type { EnsembleFormat, PointEnsemble } from './ensemble'
import { readEnsemble } from './read'

export type StoredFormat = EnsembleFormat | 'zip'

export const DEFAULT_MAX_UNCOMPRESSED_BYTES = 2 ** 30
export const DEFAULT_MAX_ENTRIES = 10_000
/** Extensions of the files read inside a zip archive. */
const POINT_FILE_EXTENSIONS = new Set(['csv', 'tsv', 'txt', 'dat', 'xyz', 'tab', 'ssv', 'json', 'npy'])
/** Separator between an archive's name and an entry's name in messages, e.g. "runs.zip › beta2/n400.csv". */
export const ENTRY_SEPARATOR = ' › '

export function isZipMagic(bytes: Uint8Array): boolean {
  // Local file header "PK\x03\x04", or the end-of-central-directory record "PK\x05\x06" of an empty archive.
  return bytes.length >= 4 && bytes[0] === 0x50 && bytes[1] === 0x4b
    && ((bytes[2] === 3 && bytes[3] === 4) || (bytes[2] === 5 && bytes[3] === 6))
}

export function extensionOf(name: string): string {
  const base = name.slice(name.lastIndexOf('/') + 1)
  const dot = base.lastIndexOf('.')
  return dot > 0 ? base.slice(dot + 1).toLowerCase() : ''
}

/** Directories, macOS resource forks and hidden files (any path component starting with '.') are skipped. */
function isSkippedEntry(name: string): boolean {
  if (name.endsWith('/')) return true
  const parts = name.split('/')
  return parts[0] === '__MACOSX' || parts.some(p => p.startsWith('.'))
}

export interface ZipEntry {
  name: string
  bytes: Uint8Array
}

export function openZip(bytes: Uint8Array, zipName: string, maxBytes: number, maxEntries: number): ZipEntry[] {
  const listed: Array<{ name: string, size: number }> = []
  let count = 0
  const damaged = (error: unknown): EngineInputError => {
    const detail = error instanceof Error ? error.message : String(error)
    return new EngineInputError(`${zipName}: the zip archive cannot be read (${detail})`, { file: zipName })
  }
  try {
    unzipSync(bytes, {
      filter: (file) => {
        count++
        if (count <= maxEntries && !isSkippedEntry(file.name)) listed.push({ name: file.name, size: file.originalSize })
        return false
      },
    })
  }
  catch (error) {
    throw damaged(error)
  }
  if (count === 0) throw new EngineInputError(`${zipName}: the zip archive is empty`, { file: zipName })
  if (count > maxEntries) throw new EngineInputError(`${zipName}: the zip archive has ${count} entries, more than the ${maxEntries} allowed`, { file: zipName })
  if (listed.length === 0) throw new EngineInputError(`${zipName}: the zip archive holds no point files (only directories or hidden files)`, { file: zipName })
  let total = 0
  for (const entry of listed) {
    const file = `${zipName}${ENTRY_SEPARATOR}${entry.name}`
    total += entry.size
    if (entry.size > maxBytes) {
      throw new EngineInputError(`${file}: the entry declares ${entry.size} uncompressed bytes, more than the ${maxBytes} allowed`, { file })
    }
    if (total > maxBytes) {
      throw new EngineInputError(`${zipName}: the entries declare more than ${maxBytes} uncompressed bytes in total (the limit is passed at ${entry.name})`, { file })
    }
    const ext = extensionOf(entry.name)
    if (ext === 'zip') throw new EngineInputError(`${file}: a zip archive inside a zip archive is not read; put all point files in one archive`, { file })
    if (ext !== '' && !POINT_FILE_EXTENSIONS.has(ext)) {
      throw new EngineInputError(`${file}: not a point file (.${ext}); an archive may hold only .csv, .tsv, .txt, .dat, .json and .npy files`, { file })
    }
  }
  const wanted = new Set(listed.map(e => e.name))
  let files: Record<string, Uint8Array>
  try {
    // The declared size bounds the output buffer of each entry, so a false size cannot make it grow.
    files = unzipSync(bytes, { filter: file => wanted.has(file.name) })
  }
  catch (error) {
    throw damaged(error)
  }
  return listed.map(e => ({ name: e.name, bytes: files[e.name] ?? new Uint8Array(0) }))
}

export interface StoredReadOptions {
  /** Applied to each point file as it is read (e.g. validation for a geometry); returns it. */
  check?: (ensemble: PointEnsemble, file: string) => PointEnsemble
  maxUncompressedBytes?: number
  maxEntries?: number
}

/** Reads a point file or a zip of point files into one ensemble; configurations from a zip carry
 *  the label file: <entry name>, and messages name the entry as "archive.zip › entry". */
export function readStoredEnsemble(bytes: Uint8Array, name: string, options: StoredReadOptions = {}): { format: StoredFormat, ensemble: PointEnsemble } {
  const check = options.check ?? (e => e)
  if (!isZipMagic(bytes) && extensionOf(name) !== 'zip') {
    const ensemble = check(readEnsemble(bytes, name), name)
    return { format: ensemble.format, ensemble }
  }
  if (!isZipMagic(bytes)) throw new EngineInputError(`${name}: the file is named .zip but is not a zip archive`, { file: name })
  const entries = openZip(bytes, name, options.maxUncompressedBytes ?? DEFAULT_MAX_UNCOMPRESSED_BYTES, options.maxEntries ?? DEFAULT_MAX_ENTRIES)
  const ensemble: PointEnsemble = { d: 0, configurations: [], labels: [], format: 'text', warnings: [], fileName: name }
  for (const entry of entries) {
    const file = `${name}${ENTRY_SEPARATOR}${entry.name}`
    // Each entry is checked on its own, so all entries share the dimension the check asks for.
    const part = check(readEnsemble(entry.bytes, file), file)
    ensemble.d = part.d
    part.configurations.forEach((c, m) => {
      ensemble.configurations.push(c)
      ensemble.labels.push({ ...(part.labels[m] ?? {}), file: entry.name })
    })
    for (const warning of part.warnings) ensemble.warnings.push(`${file}: ${warning}`)
  }
  return { format: 'zip', ensemble }
}
