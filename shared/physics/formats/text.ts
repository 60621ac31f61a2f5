// Reader for delimited text tables of points: comma-separated (RFC 4180, without multi-line
// quoted fields), tab-separated, or whitespace-separated columns, with an optional header line
// naming the columns x, y, z and config (or configuration). Lines starting with '#' and blank
// lines are skipped; without a config column, blank lines separate configurations (common
// practice for plain-text point files). Line numbers in errors are those of the file.
import { decodeText } from './decode'
import { PointBuffer, type LabelValue, type PointEnsemble } from './ensemble'
import { inputError, quote } from './location'
import { parseDecimal } from './numbers'

export type TextDelimiter = 'comma' | 'tab' | 'whitespace'

interface Layout {
  width: number
  /** For each column, the coordinate it holds (0 = x, 1 = y, 2 = z) or −1 for the config column. */
  role: Int32Array
  d: number
  configColumn: number
  definedOn: number
}

interface Group {
  key: string
  label: LabelValue
  buffer: PointBuffer
  lastLine: number
  warned: boolean
}

const COORDINATE_NAMES = ['x', 'y', 'z']

function isBlank(c: number): boolean {
  return c === 32 || c === 9 || c === 13
}

/** Splits t[s, e) into fields; starts/ends receive trimmed bounds (quotes removed). */
function splitFields(t: string, s: number, e: number, delimiter: TextDelimiter, starts: number[], ends: number[]): void {
  starts.length = 0
  ends.length = 0
  if (delimiter === 'whitespace') {
    let i = s
    for (;;) {
      while (i < e && isBlank(t.charCodeAt(i))) i++
      if (i >= e) break
      const a = i
      while (i < e && !isBlank(t.charCodeAt(i))) i++
      pushField(t, a, i, starts, ends)
    }
    return
  }
  const sep = delimiter === 'comma' ? 44 : 9
  let fieldStart = s
  for (let i = s; ; i++) {
    if (i === e || t.charCodeAt(i) === sep) {
      let a = fieldStart
      let b = i
      while (a < b && isBlank(t.charCodeAt(a))) a++
      while (b > a && isBlank(t.charCodeAt(b - 1))) b--
      pushField(t, a, b, starts, ends)
      if (i === e) break
      fieldStart = i + 1
    }
  }
}

function pushField(t: string, a: number, b: number, starts: number[], ends: number[]): void {
  if (b - a >= 2 && t.charCodeAt(a) === 34 && t.charCodeAt(b - 1) === 34) {
    a++
    b--
  }
  starts.push(a)
  ends.push(b)
}

function detectDelimiter(t: string, s: number, e: number, file: string, line: number): TextDelimiter {
  const row = t.slice(s, e)
  if (row.includes(',')) return 'comma'
  if (row.includes(';')) {
    throw inputError('semicolon-separated values are not read; separate columns by commas, tabs or spaces and write decimals with a point', { file, line, column: row.indexOf(';') + 1 })
  }
  if (row.includes('\t')) {
    const starts: number[] = []
    const ends: number[] = []
    splitFields(t, s, e, 'tab', starts, ends)
    for (let k = 0; k < starts.length; k++) if (starts[k] === ends[k]) return 'whitespace'
    return 'tab'
  }
  return 'whitespace'
}

function delimiterName(delimiter: TextDelimiter): string {
  return delimiter === 'comma' ? 'commas' : delimiter === 'tab' ? 'tabs' : 'spaces or tabs'
}

/** Reads a delimited text table of points (see the header of this file for the layout). */
export function readText(input: Uint8Array | string, fileName = 'input'): PointEnsemble {
  const file = fileName
  let t = decodeText(input, file)
  if (!t.includes('\n') && t.includes('\r')) t = t.replace(/\r/g, '\n')
  const n = t.length
  const starts: number[] = []
  const ends: number[] = []
  const warnings: string[] = []
  let delimiter: TextDelimiter = 'whitespace'
  let layout: Layout | undefined
  const blocks: PointBuffer[] = []
  let current: PointBuffer | undefined
  const groups = new Map<string, Group>()
  let lastGroup: Group | undefined
  let headerLine = 0

  let pos = 0
  let line = 0
  while (pos <= n) {
    let end = t.indexOf('\n', pos)
    if (end < 0) end = n
    line++
    let lineEnd = end
    if (lineEnd > pos && t.charCodeAt(lineEnd - 1) === 13) lineEnd--
    let first = pos
    while (first < lineEnd && isBlank(t.charCodeAt(first))) first++
    if (first === lineEnd) {
      if (current !== undefined && current.count > 0) {
        blocks.push(current)
        current = undefined
      }
    }
    else if (t.charCodeAt(first) !== 35) {
      if (layout === undefined) {
        delimiter = detectDelimiter(t, pos, lineEnd, file, line)
        splitFields(t, pos, lineEnd, delimiter, starts, ends)
        let numeric = 0
        for (let k = 0; k < starts.length; k++) if (parseDecimal(t, starts[k], ends[k]) !== undefined) numeric++
        if (numeric === 0) {
          layout = readHeader(t, pos, line, starts, ends, file)
          headerLine = line
          pos = end + 1
          if (end === n) break
          continue
        }
        layout = { width: starts.length, role: Int32Array.from(starts, (_, k) => k), d: starts.length, configColumn: -1, definedOn: line }
      }
      else {
        splitFields(t, pos, lineEnd, delimiter, starts, ends)
      }
      const width = starts.length
      if (width !== layout.width) {
        const column = width > layout.width ? starts[layout.width] - pos + 1 : lineEnd - pos + 1
        const reference = headerLine > 0 ? `the header on line ${headerLine}` : `line ${layout.definedOn}`
        throw inputError(`found ${width} column${width === 1 ? '' : 's'}, expected ${layout.width} (as in ${reference}; columns are separated by ${delimiterName(delimiter)})`, { file, line, column })
      }
      let buffer: PointBuffer
      if (layout.configColumn >= 0) {
        const a = starts[layout.configColumn]
        const b = ends[layout.configColumn]
        if (a === b) throw inputError('the config column is empty', { file, line, column: a - pos + 1 })
        const key = t.slice(a, b)
        let group = lastGroup !== undefined && lastGroup.key === key ? lastGroup : groups.get(key)
        if (group === undefined) {
          const value = parseDecimal(t, a, b)
          group = { key, label: value !== undefined && Number.isFinite(value) ? value : key, buffer: new PointBuffer(layout.d), lastLine: line, warned: false }
          groups.set(key, group)
        }
        else if (group !== lastGroup && !group.warned) {
          group.warned = true
          warnings.push(`rows of configuration ${quote(key)} are not contiguous: line ${line} continues it after line ${group.lastLine}`)
        }
        group.lastLine = line
        lastGroup = group
        buffer = group.buffer
      }
      else {
        if (current === undefined) current = new PointBuffer(layout.d)
        buffer = current
      }
      const offset = buffer.add(line)
      const values = buffer.values
      for (let k = 0; k < width; k++) {
        const role = layout.role[k]
        if (role < 0) continue
        const a = starts[k]
        const b = ends[k]
        if (a === b) throw inputError(`column ${k + 1} is empty`, { file, line, column: a - pos + 1 })
        const value = parseDecimal(t, a, b)
        if (value === undefined) {
          const hint = line === layout.definedOn && headerLine === 0 ? ' (a header line must name every column: x, y, z and optionally config)' : ''
          throw inputError(`${quote(t.slice(a, b))} is not a number${hint}`, { file, line, column: a - pos + 1 })
        }
        values[offset + role] = value
      }
    }
    pos = end + 1
    if (end === n) break
  }
  if (current !== undefined && current.count > 0) blocks.push(current)

  const buffers = layout !== undefined && layout.configColumn >= 0 ? [...groups.values()].map(g => g.buffer) : blocks
  if (buffers.length === 0) throw inputError('no points found (only blank lines, comments or a header)', { file })
  const labels: Array<Record<string, LabelValue>> = layout !== undefined && layout.configColumn >= 0
    ? [...groups.values()].map(g => ({ config: g.label }))
    : buffers.map(() => ({}))
  return {
    d: layout === undefined ? 0 : layout.d,
    configurations: buffers.map(b => b.toConfiguration()),
    labels,
    format: 'text',
    warnings,
    fileName,
    pointLines: buffers.map(b => b.pointLines()),
  }
}

function readHeader(t: string, lineStart: number, line: number, starts: number[], ends: number[], file: string): Layout {
  const width = starts.length
  const role = new Int32Array(width)
  const seen = new Map<string, number>()
  let configColumn = -1
  let d = 0
  for (let k = 0; k < width; k++) {
    const column = starts[k] - lineStart + 1
    const raw = t.slice(starts[k], ends[k])
    const name = raw.toLowerCase()
    if (name === '') throw inputError(`column ${k + 1} of the header has no name`, { file, line, column })
    const canonical = name === 'configuration' ? 'config' : name
    const before = seen.get(canonical)
    if (before !== undefined) throw inputError(`column ${quote(raw)} appears twice in the header (columns ${before + 1} and ${k + 1})`, { file, line, column })
    seen.set(canonical, k)
    const coordinate = COORDINATE_NAMES.indexOf(canonical)
    if (coordinate >= 0) {
      role[k] = coordinate
      d++
    }
    else if (canonical === 'config') {
      role[k] = -1
      configColumn = k
    }
    else {
      throw inputError(`unknown column ${quote(raw)}; the allowed columns are x, y, z and config (or configuration). Per-configuration labels such as N or β belong in the JSON form`, { file, line, column })
    }
  }
  if (d === 0) throw inputError('the header names no coordinate column (x, y or z)', { file, line, column: 1 })
  for (let c = 0; c < d; c++) {
    if (!seen.has(COORDINATE_NAMES[c])) {
      throw inputError(`the header has ${d} coordinate column${d === 1 ? '' : 's'} but no ${COORDINATE_NAMES[c]}; coordinates are x, then x and y, then x, y and z`, { file, line, column: 1 })
    }
  }
  return { width, role, d, configColumn, definedOn: line }
}
