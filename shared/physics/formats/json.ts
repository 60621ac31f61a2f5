// Reader for point ensembles written as JSON (RFC 8259 / ECMA-404), in one of three shapes:
//   [[x, y], …]                     one configuration
//   [[[x, y], …], …]                several configurations
//   { "configurations": [ { "points": [[…], …], "labels": { … } }, … ] }   (optional "d")
// A small schema-directed parser keeps the line and column of every token, so that errors name
// the JSON path (e.g. configurations[2].points[17][1]) and the place in the file.
import { decodeText } from './decode'
import { PointBuffer, type LabelValue, type PointEnsemble } from './ensemble'
import { inputError } from './location'

type PathSegment = string | number

const IDENTIFIER = /^[A-Za-z_$][A-Za-z0-9_$]*$/
const SIMPLE_ESCAPES: Record<number, string | undefined> = { 34: '"', 92: '\\', 47: '/', 98: '\b', 102: '\f', 110: '\n', 114: '\r', 116: '\t' }

/** Formats a JSON path such as configurations[2].points[17][1]. */
export function formatJsonPath(path: readonly PathSegment[]): string {
  if (path.length === 0) return 'the top level'
  let out = ''
  for (const segment of path) {
    if (typeof segment === 'number') out += `[${segment}]`
    else if (IDENTIFIER.test(segment)) out += out === '' ? segment : `.${segment}`
    else out += `[${JSON.stringify(segment)}]`
  }
  return out
}

class JsonCursor {
  pos = 0
  line = 1
  lineStart = 0
  readonly path: PathSegment[] = []
  /** Configuration and point being read, for error locations. */
  configuration: number | undefined
  point: number | undefined

  constructor(readonly t: string, readonly file: string) {}

  /** Skips white space; returns the next character code, or −1 at the end of the text. */
  peek(): number {
    const t = this.t
    const n = t.length
    let p = this.pos
    while (p < n) {
      const c = t.charCodeAt(p)
      if (c === 32 || c === 9 || c === 13) p++
      else if (c === 10) {
        p++
        this.line++
        this.lineStart = p
      }
      else {
        this.pos = p
        return c
      }
    }
    this.pos = p
    return -1
  }

  column(): number {
    return this.pos - this.lineStart + 1
  }

  fail(message: string): never {
    const where = { file: this.file, line: this.line, column: this.column() }
    if (this.configuration === undefined) throw inputError(message, where)
    throw inputError(message, { ...where, configuration: this.configuration, index: this.point })
  }

  here(): string {
    return formatJsonPath(this.path)
  }

  found(c: number): string {
    if (c < 0) return 'the end of the file'
    if (c === 34) return 'a string'
    if (c === 45 || (c >= 48 && c <= 57)) return 'a number'
    if (c === 116 || c === 102) return 'true/false'
    if (c === 110) return 'null'
    if (c === 123) return 'an object'
    if (c === 91) return 'an array'
    return `'${String.fromCharCode(c)}'`
  }

  expect(code: number, what: string): void {
    const c = this.peek()
    if (c !== code) this.fail(`expected ${what} at ${this.here()}, found ${this.found(c)}`)
    this.pos++
  }

  /** After an element: consumes ',' (returns true) or the closing bracket (returns false). */
  next(close: number): boolean {
    const c = this.peek()
    if (c === 44) {
      this.pos++
      return true
    }
    if (c === close) {
      this.pos++
      return false
    }
    this.fail(`expected ',' or '${String.fromCharCode(close)}' after ${this.here()}, found ${this.found(c)}`)
  }

  /** A JSON number (RFC 8259 §6); overflow gives ±Infinity, which the validation reports. */
  number(): number {
    const c0 = this.peek()
    const t = this.t
    const s = this.pos
    let i = s
    if (t.charCodeAt(i) === 45) i++
    const intStart = i
    while (i < t.length && t.charCodeAt(i) >= 48 && t.charCodeAt(i) <= 57) i++
    let ok = i > intStart && !(t.charCodeAt(intStart) === 48 && i - intStart > 1)
    if (ok && t.charCodeAt(i) === 46) {
      i++
      const f = i
      while (i < t.length && t.charCodeAt(i) >= 48 && t.charCodeAt(i) <= 57) i++
      ok = i > f
    }
    if (ok && (t.charCodeAt(i) === 101 || t.charCodeAt(i) === 69)) {
      i++
      if (t.charCodeAt(i) === 43 || t.charCodeAt(i) === 45) i++
      const e = i
      while (i < t.length && t.charCodeAt(i) >= 48 && t.charCodeAt(i) <= 57) i++
      ok = i > e
    }
    if (!ok) {
      const word = /^-?(nan|infinity|inf)/i.exec(t.slice(s, s + 10))
      if (word) this.fail(`${word[0]} at ${this.here()} is not a JSON number (JSON has no NaN or infinity)`)
      this.fail(`expected a number at ${this.here()}, found ${this.found(c0)}`)
    }
    this.pos = i
    return Number(t.slice(s, i))
  }

  /** A JSON string with its escapes (RFC 8259 §7). */
  string(): string {
    const c0 = this.peek()
    if (c0 !== 34) this.fail(`expected a string at ${this.here()}, found ${this.found(c0)}`)
    const t = this.t
    let i = this.pos + 1
    let out = ''
    let chunk = i
    for (;;) {
      if (i >= t.length) this.fail('a string is not closed before the end of the file')
      const c = t.charCodeAt(i)
      if (c === 34) break
      if (c < 32) {
        this.pos = i
        this.fail(`control character in a string at ${this.here()}`)
      }
      if (c === 92) {
        out += t.slice(chunk, i)
        const e = t.charCodeAt(i + 1)
        const simple = SIMPLE_ESCAPES[e]
        if (simple !== undefined) {
          out += simple
          i += 2
        }
        else if (e === 117 && /^[0-9a-fA-F]{4}$/.test(t.slice(i + 2, i + 6))) {
          out += String.fromCharCode(parseInt(t.slice(i + 2, i + 6), 16))
          i += 6
        }
        else {
          this.pos = i
          this.fail(`invalid escape in a string at ${this.here()}`)
        }
        chunk = i
        continue
      }
      i++
    }
    out += t.slice(chunk, i)
    this.pos = i + 1
    return out
  }
}

interface Reading {
  d: number
  firstPoint: string
  buffers: PointBuffer[]
  labels: Array<Record<string, LabelValue>>
}

/** Counts the coordinates of the point that starts at the cursor, without consuming it. */
function peekPointSize(cur: JsonCursor): number {
  const save = { pos: cur.pos, line: cur.line, lineStart: cur.lineStart }
  cur.expect(91, 'a point (an array of coordinates)')
  let count = 0
  if (cur.peek() !== 93) {
    cur.path.push(0)
    for (;;) {
      cur.path[cur.path.length - 1] = count
      cur.number()
      count++
      if (!cur.next(93)) break
    }
    cur.path.pop()
  }
  Object.assign(cur, save)
  return count
}

/** Reads one configuration: an array of points, each an array of d numbers. */
function readPoints(cur: JsonCursor, reading: Reading): void {
  cur.expect(91, 'an array of points')
  cur.configuration = reading.buffers.length
  if (cur.peek() === 93) cur.fail(`the configuration at ${cur.here()} has no points`)
  const path = cur.path
  path.push(0)
  const depth = path.length - 1
  cur.point = 0
  if (reading.d === 0) {
    reading.d = peekPointSize(cur)
    reading.firstPoint = cur.here()
  }
  const d = reading.d
  const buffer = new PointBuffer(Math.max(d, 1))
  for (let k = 0; ; k++) {
    path[depth] = k
    cur.point = k
    cur.expect(91, 'a point (an array of coordinates)')
    const line = cur.line
    if (cur.peek() === 93) cur.fail(`the point at ${cur.here()} has no coordinates`)
    const offset = buffer.add(line)
    const values = buffer.values
    path.push(0)
    for (let j = 0; ; j++) {
      path[depth + 1] = j
      if (j >= d) {
        cur.peek()
        cur.fail(`the point at ${formatJsonPath(path.slice(0, -1))} has more than ${d} coordinate${d === 1 ? '' : 's'} (the point at ${reading.firstPoint} has ${d})`)
      }
      values[offset + j] = cur.number()
      if (!cur.next(93)) {
        if (j + 1 < d) {
          cur.pos--
          cur.fail(`the point at ${formatJsonPath(path.slice(0, -1))} has ${j + 1} coordinate${j === 0 ? '' : 's'}, expected ${d} (as at ${reading.firstPoint})`)
        }
        break
      }
    }
    path.pop()
    cur.point = undefined
    if (!cur.next(93)) break
  }
  path.pop()
  cur.configuration = undefined
  reading.buffers.push(buffer)
}

function readLabels(cur: JsonCursor): Record<string, LabelValue> {
  const labels: Record<string, LabelValue> = {}
  cur.expect(123, 'an object of labels')
  if (cur.peek() === 125) {
    cur.pos++
    return labels
  }
  for (;;) {
    const key = cur.string()
    cur.path.push(key)
    if (Object.prototype.hasOwnProperty.call(labels, key)) cur.fail(`the label ${JSON.stringify(key)} appears twice`)
    cur.expect(58, '\':\'')
    const c = cur.peek()
    if (c === 34) labels[key] = cur.string()
    else if (c === 45 || (c >= 48 && c <= 57)) {
      const value = cur.number()
      if (!Number.isFinite(value)) cur.fail(`the label at ${cur.here()} is too large for a double`)
      labels[key] = value
    }
    else cur.fail(`the label at ${cur.here()} must be a string or a number, found ${cur.found(c)}`)
    cur.path.pop()
    if (!cur.next(125)) break
  }
  return labels
}

function readConfigurationObject(cur: JsonCursor, reading: Reading): void {
  cur.expect(123, 'a configuration object { "points": … }')
  const line = cur.line
  const column = cur.column() - 1
  let labels: Record<string, LabelValue> = {}
  let sawPoints = false
  let sawLabels = false
  if (cur.peek() !== 125) {
    for (;;) {
      const key = cur.string()
      cur.path.push(key)
      cur.expect(58, '\':\'')
      if (key === 'points' && !sawPoints) {
        sawPoints = true
        readPoints(cur, reading)
      }
      else if (key === 'labels' && !sawLabels) {
        sawLabels = true
        labels = readLabels(cur)
      }
      else if (key === 'points' || key === 'labels') {
        cur.fail(`the key ${JSON.stringify(key)} appears twice`)
      }
      else {
        cur.fail(`unknown key ${JSON.stringify(key)} at ${cur.here()}; a configuration has "points" and optionally "labels"`)
      }
      cur.path.pop()
      if (!cur.next(125)) break
    }
  }
  else cur.pos++
  if (!sawPoints) throw inputError(`the configuration at ${cur.here()} has no "points"`, { file: cur.file, line, column })
  reading.labels.push(labels)
}

function readObjectForm(cur: JsonCursor, reading: Reading): void {
  cur.expect(123, '{')
  let declaredD: number | undefined
  let dAt: { line: number, column: number } | undefined
  let sawConfigurations = false
  if (cur.peek() !== 125) {
    for (;;) {
      const key = cur.string()
      cur.path.push(key)
      cur.expect(58, '\':\'')
      if (key === 'configurations' && !sawConfigurations) {
        sawConfigurations = true
        cur.expect(91, 'an array of configurations')
        if (cur.peek() === 93) cur.fail('"configurations" is empty')
        cur.path.push(0)
        for (let m = 0; ; m++) {
          cur.path[cur.path.length - 1] = m
          readConfigurationObject(cur, reading)
          if (!cur.next(93)) break
        }
        cur.path.pop()
      }
      else if (key === 'd' && declaredD === undefined) {
        cur.peek()
        dAt = { line: cur.line, column: cur.column() }
        declaredD = cur.number()
      }
      else if (key === 'd' || key === 'configurations') {
        cur.fail(`the key ${JSON.stringify(key)} appears twice`)
      }
      else {
        cur.fail(`unknown key ${JSON.stringify(key)} at the top level; the allowed keys are "configurations" and "d"`)
      }
      cur.path.pop()
      if (!cur.next(125)) break
    }
  }
  else cur.pos++
  if (!sawConfigurations) throw inputError('the object has no "configurations"', { file: cur.file, line: 1, column: 1 })
  if (declaredD !== undefined && declaredD !== reading.d) {
    throw inputError(`"d" is ${declaredD} but the points have ${reading.d} coordinates`, { file: cur.file, ...dAt })
  }
}

function readArrayForm(cur: JsonCursor, reading: Reading): void {
  // Look two brackets ahead: [[number → one configuration, [[[ → several.
  const save = { pos: cur.pos, line: cur.line, lineStart: cur.lineStart }
  cur.pos++
  if (cur.peek() === 93) cur.fail('the array is empty: no points')
  let several = false
  if (cur.peek() === 91) {
    cur.pos++
    const c = cur.peek()
    if (c === 93) cur.fail('empty array at [0]: neither a point nor a configuration')
    several = c === 91
  }
  Object.assign(cur, save)
  if (!several) {
    readPoints(cur, reading)
    reading.labels.push({})
    return
  }
  cur.expect(91, '[')
  cur.path.push(0)
  for (let m = 0; ; m++) {
    cur.path[cur.path.length - 1] = m
    readPoints(cur, reading)
    reading.labels.push({})
    if (!cur.next(93)) break
  }
  cur.path.pop()
}

/** Reads a JSON ensemble in any of the three shapes listed at the top of this file. */
export function readJson(input: Uint8Array | string, fileName = 'input'): PointEnsemble {
  const cur = new JsonCursor(decodeText(input, fileName), fileName)
  const reading: Reading = { d: 0, firstPoint: '', buffers: [], labels: [] }
  const c = cur.peek()
  if (c === 91) readArrayForm(cur, reading)
  else if (c === 123) readObjectForm(cur, reading)
  else cur.fail(`expected '[' or '{' at the start of the JSON, found ${cur.found(c)}`)
  const after = cur.peek()
  if (after !== -1) cur.fail(`unexpected ${cur.found(after)} after the end of the JSON value`)
  return {
    d: reading.d,
    configurations: reading.buffers.map(b => b.toConfiguration()),
    labels: reading.labels,
    format: 'json',
    warnings: [],
    fileName,
    pointLines: reading.buffers.map(b => b.pointLines()),
  }
}
