// Writers for the text forms of an ensemble: CSV (RFC 4180) with a header x, y[, z] and a leading
// config column when there are several configurations, and the JSON object form
// { "d": d, "configurations": [ { "labels": { … }, "points": [[…], …] } ] } (RFC 8259).
// Numbers are written as the shortest decimal that reads back to the same double (ECMA-262
// Number::toString), so both forms round-trip bit for bit; negative zero is written "-0".
import { EngineInputError } from '../errors'
import type { PointEnsemble } from './ensemble'
import { formatNumber } from './numbers'

const COORDINATE_NAMES = ['x', 'y', 'z']

function checkShape(ensemble: PointEnsemble, writer: string): void {
  if (ensemble.configurations.length === 0) throw new EngineInputError(`${writer}: the ensemble has no configurations`)
  ensemble.configurations.forEach((c, m) => {
    if (c.d !== ensemble.d) throw new EngineInputError(`${writer}: configuration ${m} has d = ${c.d}, the ensemble has d = ${ensemble.d}`, { configuration: m })
    if (c.points.length !== c.N * c.d) throw new EngineInputError(`${writer}: configuration ${m} has ${c.points.length} values, not N·d = ${c.N * c.d}`, { configuration: m })
  })
}

/** Names used in the config column: the configurations' own config labels when they are distinct and plain, else 0 … M−1. */
function configNames(ensemble: PointEnsemble): string[] {
  const own = ensemble.labels.map(l => (l === undefined ? undefined : l.config))
  const names = own.map(v => (v === undefined ? '' : typeof v === 'number' ? formatNumber(v) : v))
  const plain = names.every(s => s !== '' && !/[",\n\r#]/.test(s) && s.trim() === s)
  if (plain && names.length === ensemble.configurations.length && new Set(names).size === names.length) return names
  return ensemble.configurations.map((_, m) => String(m))
}

/**
 * CSV with a header line; one row per point. With several configurations a first column
 * `config` names each row's configuration. Labels other than config are not written (use JSON).
 */
export function writeCsv(ensemble: PointEnsemble): string {
  checkShape(ensemble, 'writeCsv')
  const d = ensemble.d
  if (d < 1 || d > 3) throw new EngineInputError(`writeCsv: d = ${d} cannot be named by the columns x, y, z; write JSON or NPY instead`)
  const several = ensemble.configurations.length > 1
  const names = several ? configNames(ensemble) : []
  const lines: string[] = [(several ? ['config', ...COORDINATE_NAMES.slice(0, d)] : COORDINATE_NAMES.slice(0, d)).join(',')]
  const row: string[] = []
  ensemble.configurations.forEach((c, m) => {
    const p = c.points
    for (let i = 0; i < c.N; i++) {
      row.length = 0
      if (several) row.push(names[m])
      for (let k = 0; k < d; k++) row.push(formatNumber(p[i * d + k]))
      lines.push(row.join(','))
    }
  })
  lines.push('')
  return lines.join('\n')
}

/** The JSON object form with labels; NaN and ±∞ cannot be written in JSON and raise an error. */
export function writeJson(ensemble: PointEnsemble): string {
  checkShape(ensemble, 'writeJson')
  const d = ensemble.d
  const parts: string[] = ['{\n  "d": ', String(d), ',\n  "configurations": [\n']
  ensemble.configurations.forEach((c, m) => {
    const labels = ensemble.labels[m] ?? {}
    const entries = Object.entries(labels).map(([key, value]) => {
      if (typeof value === 'number' && !Number.isFinite(value)) {
        throw new EngineInputError(`writeJson: label ${JSON.stringify(key)} of configuration ${m} is ${value}, which JSON cannot hold`, { configuration: m })
      }
      return `${JSON.stringify(key)}: ${typeof value === 'number' ? formatNumber(value) : JSON.stringify(value)}`
    })
    parts.push(m === 0 ? '' : ',\n', '    {\n      "labels": {', entries.join(', '), '},\n      "points": [\n')
    const p = c.points
    const row: string[] = []
    for (let i = 0; i < c.N; i++) {
      row.length = 0
      for (let k = 0; k < d; k++) {
        const x = p[i * d + k]
        if (!Number.isFinite(x)) {
          throw new EngineInputError(`writeJson: configuration ${m}, point ${i}, coordinate ${k} is ${x}, which JSON cannot hold; write CSV or NPY instead`, { configuration: m, index: i })
        }
        row.push(formatNumber(x))
      }
      parts.push(i === 0 ? '        [' : ',\n        [', row.join(', '), ']')
    }
    parts.push('\n      ]\n    }')
  })
  parts.push('\n  ]\n}\n')
  return parts.join('')
}
