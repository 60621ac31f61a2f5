// The NPY array file (NumPy Enhancement Proposal 1, "A Simple File Format for NumPy Arrays",
// Kern 2007, with format versions 2.0 and 3.0 described in numpy.lib.format): the magic string
// "\x93NUMPY", a major and minor version byte, the header length (little-endian uint16 in 1.0,
// uint32 in 2.0 and 3.0), then an ASCII (UTF-8 in 3.0) Python dict literal with the keys 'descr',
// 'fortran_order' and 'shape', padded with spaces and ended by '\n' so that the data start is
// aligned (16 bytes in the 1.0 text, 64 bytes in what NumPy writes), then the raw array data.
// The header is parsed here by a small literal parser; it is never evaluated.
import type { Configuration } from '../types'
import { isEnsemble, type PointEnsemble } from './ensemble'
import { EngineInputError } from '../errors'
import { inputError } from './location'

export const NPY_MAGIC = [0x93, 0x4e, 0x55, 0x4d, 0x50, 0x59] as const

/** True when the bytes start with the NPY magic string "\x93NUMPY". */
export function hasNpyMagic(bytes: Uint8Array): boolean {
  if (bytes.length < NPY_MAGIC.length) return false
  for (let i = 0; i < NPY_MAGIC.length; i++) if (bytes[i] !== NPY_MAGIC[i]) return false
  return true
}

type PyValue = string | number | boolean | null | PyValue[] | Map<string, PyValue>

/** Parses a Python literal made of dicts, tuples, lists, strings, integers, True, False, None. */
export function parsePythonLiteral(text: string): PyValue {
  let i = 0
  const n = text.length
  const fail = (what: string): never => {
    throw new EngineInputError(`NPY header, character ${i + 1}: ${what}`, { column: i + 1 })
  }
  const skip = (): void => {
    while (i < n && (text[i] === ' ' || text[i] === '\t' || text[i] === '\n' || text[i] === '\r')) i++
  }
  const value = (): PyValue => {
    skip()
    const c = text[i]
    if (c === '{') {
      i++
      const map = new Map<string, PyValue>()
      for (;;) {
        skip()
        if (text[i] === '}') {
          i++
          return map
        }
        const key = value()
        if (typeof key !== 'string') fail('dict keys must be strings')
        skip()
        if (text[i] !== ':') fail('expected \':\'')
        i++
        map.set(key as string, value())
        skip()
        if (text[i] === ',') i++
        else if (text[i] !== '}') fail('expected \',\' or \'}\'')
      }
    }
    if (c === '(' || c === '[') {
      const close = c === '(' ? ')' : ']'
      i++
      const items: PyValue[] = []
      for (;;) {
        skip()
        if (text[i] === close) {
          i++
          return items
        }
        items.push(value())
        skip()
        if (text[i] === ',') i++
        else if (text[i] !== close) fail(`expected ',' or '${close}'`)
      }
    }
    if (c === '\'' || c === '"') {
      const start = ++i
      while (i < n && text[i] !== c) {
        if (text[i] === '\\') fail('escapes in strings are not supported')
        i++
      }
      if (i >= n) fail('unterminated string')
      return text.slice(start, i++)
    }
    const word = /^(True|False|None|-?\d+L?)/.exec(text.slice(i, i + 32))
    if (!word) fail(`unexpected ${i < n ? JSON.stringify(text[i]) : 'end of header'}`)
    const w = (word as RegExpExecArray)[0]
    i += w.length
    if (w === 'True') return true
    if (w === 'False') return false
    if (w === 'None') return null
    return Number(w.endsWith('L') ? w.slice(0, -1) : w)
  }
  const result = value()
  skip()
  if (i < n) fail('unexpected text after the header dict')
  return result
}

export interface NpyHeader {
  major: number
  minor: number
  descr: string
  fortranOrder: boolean
  shape: number[]
  /** Byte offset of the array data. */
  dataOffset: number
}

/** Reads and checks the NPY preamble and header dict. */
export function readNpyHeader(bytes: Uint8Array, file: string, warnings: string[] = []): NpyHeader {
  const where = { file }
  if (!hasNpyMagic(bytes)) throw inputError('not an NPY file: it does not start with the magic string \\x93NUMPY', where)
  if (bytes.length < 10) throw inputError('the NPY file is truncated inside its preamble', where)
  const major = bytes[6]
  const minor = bytes[7]
  if (!(major === 1 || major === 2 || major === 3) || minor !== 0) {
    throw inputError(`NPY format version ${major}.${minor} is not read (versions 1.0, 2.0 and 3.0 are)`, where)
  }
  const view = new DataView(bytes.buffer, bytes.byteOffset, bytes.byteLength)
  const lengthBytes = major === 1 ? 2 : 4
  if (bytes.length < 8 + lengthBytes) throw inputError('the NPY file is truncated inside its preamble', where)
  const headerLength = major === 1 ? view.getUint16(8, true) : view.getUint32(8, true)
  const headerStart = 8 + lengthBytes
  const dataOffset = headerStart + headerLength
  if (dataOffset > bytes.length) throw inputError(`the NPY header says it is ${headerLength} bytes long but the file ends after ${bytes.length - headerStart}`, where)
  const headerBytes = bytes.subarray(headerStart, dataOffset)
  let header: string
  if (major === 3) {
    try {
      header = new TextDecoder('utf-8', { fatal: true }).decode(headerBytes)
    }
    catch {
      throw inputError('the NPY 3.0 header is not valid UTF-8', where)
    }
  }
  else {
    const chars: string[] = []
    for (const b of headerBytes) chars.push(String.fromCharCode(b))
    header = chars.join('')
  }
  if (!header.endsWith('\n')) warnings.push('the NPY header does not end with a newline')
  if (dataOffset % 64 !== 0 && dataOffset % 16 !== 0) warnings.push(`the NPY data start at byte ${dataOffset}, which is not a multiple of 16 or 64`)
  let dict: PyValue
  try {
    dict = parsePythonLiteral(header)
  }
  catch (error) {
    const message = error instanceof Error ? error.message : String(error)
    throw inputError(`${message} (header: ${header.trim().slice(0, 120)})`, where)
  }
  if (!(dict instanceof Map)) throw inputError('the NPY header is not a dict', where)
  for (const key of ['descr', 'fortran_order', 'shape']) {
    if (!dict.has(key)) throw inputError(`the NPY header has no '${key}' key`, where)
  }
  for (const key of dict.keys()) {
    if (key !== 'descr' && key !== 'fortran_order' && key !== 'shape') warnings.push(`the NPY header has an unexpected key '${key}' (ignored)`)
  }
  const descr = dict.get('descr')
  const fortran = dict.get('fortran_order')
  const shape = dict.get('shape')
  if (typeof descr !== 'string') throw inputError('the NPY dtype is structured (a list of fields); store a plain float64 array', where)
  if (typeof fortran !== 'boolean') throw inputError('the NPY header\'s \'fortran_order\' is not True or False', where)
  if (!Array.isArray(shape) || !shape.every(s => typeof s === 'number' && Number.isSafeInteger(s) && s >= 0)) {
    throw inputError('the NPY header\'s \'shape\' is not a tuple of non-negative integers', where)
  }
  return { major, minor, descr, fortranOrder: fortran, shape: shape as number[], dataOffset }
}

/** Reads an NPY array of shape (N, d) or (M, N, d), dtype <f8, >f8, <f4 or >f4, C order. */
export function readNpy(bytes: Uint8Array, fileName = 'input'): PointEnsemble {
  const warnings: string[] = []
  const header = readNpyHeader(bytes, fileName, warnings)
  const where = { file: fileName }
  const dtype = /^([<>=|])f([48])$/.exec(header.descr)
  if (!dtype || dtype[1] === '|') {
    throw inputError(`the NPY dtype '${header.descr}' is not read; store float64 ('<f8') or float32 ('<f4') values`, where)
  }
  if (header.fortranOrder) {
    throw inputError('the NPY array is in Fortran (column-major) order; save it in C order, e.g. numpy.save(f, numpy.ascontiguousarray(a))', where)
  }
  const little = dtype[1] !== '>'
  if (dtype[1] === '=') warnings.push('the NPY byte order \'=\' (native) was read as little-endian')
  const itemSize = dtype[2] === '8' ? 8 : 4
  if (itemSize === 4) warnings.push('the values are stored as float32 (about 7 significant digits); they were widened to float64 exactly')
  const shape = header.shape
  const shapeText = `(${shape.join(', ')}${shape.length === 1 ? ',' : ''})`
  if (shape.length !== 2 && shape.length !== 3) {
    throw inputError(`the NPY array has shape ${shapeText}; expected (N, d) for one configuration or (M, N, d) for M configurations`, where)
  }
  const [M, N, d] = shape.length === 2 ? [1, shape[0], shape[1]] : [shape[0], shape[1], shape[2]]
  if (M === 0 || N === 0 || d === 0) throw inputError(`the NPY array of shape ${shapeText} holds no points`, where)
  const count = M * N * d
  const needed = count * itemSize
  const available = bytes.length - header.dataOffset
  if (available < needed) throw inputError(`the NPY data are truncated: shape ${shapeText} needs ${needed} bytes, the file has ${available}`, where)
  if (available > needed) warnings.push(`${available - needed} bytes after the NPY array data were ignored`)
  const view = new DataView(bytes.buffer, bytes.byteOffset + header.dataOffset, needed)
  const configurations: Configuration[] = []
  for (let m = 0; m < M; m++) {
    const points = new Float64Array(N * d)
    const base = m * N * d
    if (itemSize === 8) for (let k = 0; k < points.length; k++) points[k] = view.getFloat64((base + k) * 8, little)
    else for (let k = 0; k < points.length; k++) points[k] = view.getFloat32((base + k) * 4, little)
    configurations.push({ N, d, points })
  }
  return { d, configurations, labels: configurations.map(() => ({})), format: 'npy', warnings, fileName }
}

/** The NPY 1.0 header block (dict, space padding, '\n') for a '<f8' C-order array of this shape. */
export function npyHeaderText(shape: readonly number[]): string {
  const tuple = `(${shape.join(', ')}${shape.length === 1 ? ',' : ''})`
  const dict = `{'descr': '<f8', 'fortran_order': False, 'shape': ${tuple}, }`
  const unpadded = 10 + dict.length + 1
  return dict + ' '.repeat((64 - (unpadded % 64)) % 64) + '\n'
}

/**
 * Writes one configuration as shape (N, d), or an ensemble as (N, d) when M = 1 and (M, N, d)
 * otherwise, dtype '<f8', C order, NPY version 1.0 with the data aligned to 64 bytes.
 */
export function writeNpy(data: Configuration | PointEnsemble): Uint8Array {
  const configurations = isEnsemble(data) ? data.configurations : [data]
  if (configurations.length === 0) throw new EngineInputError('writeNpy: the ensemble has no configurations')
  const first = configurations[0]
  const { N, d } = first
  configurations.forEach((c, m) => {
    if (c.points.length !== c.N * c.d) throw new EngineInputError(`writeNpy: configuration ${m} has ${c.points.length} values, not N·d = ${c.N * c.d}`, { configuration: m })
    if (c.d !== d) throw new EngineInputError(`writeNpy: configuration ${m} has d = ${c.d}, configuration 0 has d = ${d}`, { configuration: m })
    if (c.N !== N) {
      throw new EngineInputError(`writeNpy: configuration ${m} has N = ${c.N} points but configuration 0 has N = ${N}; an NPY array needs the same N in every configuration — write JSON or CSV instead`, { configuration: m })
    }
  })
  const shape = configurations.length === 1 ? [N, d] : [configurations.length, N, d]
  const header = npyHeaderText(shape)
  if (header.length > 0xffff) throw new EngineInputError('writeNpy: the header is too long for NPY version 1.0')
  const dataOffset = 10 + header.length
  const out = new Uint8Array(dataOffset + configurations.length * N * d * 8)
  out.set(NPY_MAGIC, 0)
  out[6] = 1
  out[7] = 0
  const view = new DataView(out.buffer)
  view.setUint16(8, header.length, true)
  for (let i = 0; i < header.length; i++) out[10 + i] = header.charCodeAt(i)
  let offset = dataOffset
  for (const c of configurations) {
    for (let k = 0; k < c.points.length; k++) {
      view.setFloat64(offset, c.points[k], true)
      offset += 8
    }
  }
  return out
}
