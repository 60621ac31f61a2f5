// Running one computation off the request thread: the quantity's engine command is run on each
// ensemble's stored file (configuration by configuration where it can, to report progress), and
// the JSON results become one table. The same code as the command line. Default export for piscina.
import type { MessagePort } from 'node:worker_threads'
import { findQuantity } from '../../cli/catalogue'
import { commands } from '../../cli/commands'
import type { EngineIO, OptionValues } from '../../cli/command'
import { UsageError } from '../../cli/command'
import { conventionLabel } from '../../shared/physics/conventions'
import type { EnergyConvention } from '../../shared/physics/conventions'
import { EngineInputError } from '../../shared/physics/errors'
import { readStoredEnsemble } from '../../shared/physics/formats/stored'
import { writeNpy } from '../../shared/physics/formats/npy'
import { parsePotential } from '../../shared/physics/potentials/expression'
import { withRecognisedPreset } from '../../shared/physics/potentials/recognise'
import type { Kernel } from '../../shared/physics/types'
import { ENGINE_VERSION } from '../../shared/physics/version'

export interface ComputeEnsemble {
  id: number
  name: string
  fileName: string
  bytes: Uint8Array
  setting: {
    geometry: { kind: 'free' | 'torus' | 'sphere', d?: number, L?: number }
    kernel: Kernel
    potential: string | null
    beta?: number | null
    convention: EnergyConvention
  }
}

export interface ComputeInput {
  quantity: string
  parameters: OptionValues
  ensembles: ComputeEnsemble[]
  inputHash: string
  port?: MessagePort
}

export type Cell = number | string | null

export interface ComputeTable {
  quantity: string
  columns: Array<{ name: string, label: string }>
  rows: Array<Record<string, Cell>>
  aggregates: Record<string, Cell>
  convention: string
  engineVersion: string
  inputHash: string
  notes: string[]
}

export type ComputeResult = { ok: true, table: ComputeTable } | { ok: false, reason: string }

function settingArgs(e: ComputeEnsemble): OptionValues {
  const { geometry, kernel, potential } = e.setting
  return {
    geometry: geometry.kind,
    ...(geometry.d !== undefined ? { dim: geometry.d } : {}),
    ...(geometry.L !== undefined ? { box: geometry.L } : {}),
    kernel: kernel.name,
    ...(kernel.name === 'riesz' ? { s: kernel.s } : {}),
    ...(potential ? { potential } : {}),
  }
}

/** Flattens a JSON result into table cells: numbers and short strings stay, objects become dotted names. */
function flatten(value: unknown, prefix = '', out: Record<string, Cell> = {}): Record<string, Cell> {
  if (value === null || typeof value === 'number' || typeof value === 'string' || typeof value === 'boolean') {
    out[prefix] = typeof value === 'boolean' ? String(value) : value
    return out
  }
  if (Array.isArray(value)) {
    value.forEach((v, i) => flatten(v, prefix ? `${prefix}.${i}` : String(i), out))
    return out
  }
  if (typeof value === 'object') {
    for (const [k, v] of Object.entries(value as Record<string, unknown>)) flatten(v, prefix ? `${prefix}.${k}` : k, out)
  }
  return out
}

const skipped = new Set(['engineVersion', 'inputSha256', 'geometry', 'kernel', 'potential', 'convention', 'measure', 'labels', 'input', 'selected', 'electricNote'])

function rowOf(result: Record<string, unknown>): Record<string, Cell> {
  const row: Record<string, Cell> = {}
  for (const [k, v] of Object.entries(result)) {
    if (skipped.has(k)) continue
    Object.assign(row, flatten(v, k))
  }
  for (const [k, v] of Object.entries((result.labels as Record<string, unknown> | undefined) ?? {})) row[`label.${k}`] = v as Cell
  return row
}

export async function compute(input: ComputeInput): Promise<ComputeResult> {
  const spec = findQuantity(input.quantity)
  if (!spec) return { ok: false, reason: `the engine has no quantity ${input.quantity}` }
  const command = commands.find(c => c.name === spec.command)!
  const rows: Array<Record<string, Cell>> = []
  const aggregates: Record<string, Cell> = {}
  const notes: string[] = []
  const conventions = new Set<string>()
  // Each file is read once; a per-configuration command then gets one configuration at a time, as NPY.
  const storedEnsembles = spec.perConfiguration ? input.ensembles.map(e => readStoredEnsemble(e.bytes, e.fileName).ensemble) : []
  const total = spec.perConfiguration ? storedEnsembles.reduce((n, st) => n + st.configurations.length, 0) : input.ensembles.length
  let done = 0
  const report = (note: string) => input.port?.postMessage({ done, total, note })
  try {
    for (const [index, e] of input.ensembles.entries()) {
      const stored = spec.perConfiguration ? storedEnsembles[index] : undefined
      let current: Uint8Array = e.bytes
      const io: EngineIO = { readFile: () => current, writeFile: () => undefined }
      const base: OptionValues = { ...input.parameters, ...spec.fixed, ...settingArgs(e), input: stored ? 'configuration.npy' : e.fileName }
      if (spec.command === 'energy' && base.convention === undefined) base.convention = JSON.stringify(e.setting.convention)
      conventions.add(conventionLabel(e.setting.convention, e.setting.kernel, e.setting.geometry.d ?? 2))
      const M = stored ? stored.configurations.length : 1
      for (let k = 0; k < M; k++) {
        report(`${e.name}: ${spec.perConfiguration ? `configuration ${k + 1} of ${M}` : 'all configurations'}`)
        if (stored) current = writeNpy(stored.configurations[k]!)
        const perConfiguration = spec.command === 'logz' ? partitionArgs(e, stored!.configurations[k]!.N, stored!.d, base) : base
        const args = parse(command.options, spec.perConfiguration ? perConfiguration : base)
        const result = await command.run(args, io) as Record<string, unknown>
        if (stored) rows.push({ ensemble: e.id, ...rowOf({ ...result, labels: stored.labels[k] ?? {} }), configuration: k })
        else {
          const table = result as { rows?: Array<Record<string, Cell>>, summary?: Record<string, Cell>, notes?: string[], convention?: string }
          for (const r of table.rows ?? []) rows.push({ ensemble: e.id, ...r })
          for (const [key, value] of Object.entries(table.summary ?? {})) aggregates[input.ensembles.length > 1 ? `${e.id}.${key}` : key] = value
          for (const note of table.notes ?? []) notes.push(note)
          if (table.convention) conventions.add(table.convention)
        }
        done++
      }
    }
  }
  catch (error) {
    if (error instanceof EngineInputError || error instanceof UsageError) return { ok: false, reason: error.message }
    throw error
  }
  report('done')
  if (spec.perConfiguration && rows.length > 0) Object.assign(aggregates, meansWithErrors(rows))
  const names = [...new Set(rows.flatMap(r => Object.keys(r)))]
  return {
    ok: true,
    table: {
      quantity: spec.id,
      columns: names.map(name => ({ name, label: name })),
      rows,
      aggregates,
      convention: [...conventions].join(' | '),
      engineVersion: ENGINE_VERSION,
      inputHash: input.inputHash,
      notes,
    },
  }
}

/** Mean and standard error (s/√M) across configurations of every numeric column (common practice). */
function meansWithErrors(rows: Array<Record<string, Cell>>): Record<string, Cell> {
  const out: Record<string, Cell> = { configurations: rows.length }
  const names = [...new Set(rows.flatMap(r => Object.keys(r)))].filter(n => n !== 'ensemble' && n !== 'configuration' && !n.startsWith('label.'))
  for (const name of names) {
    const values = rows.map(r => r[name]).filter((v): v is number => typeof v === 'number' && Number.isFinite(v))
    if (values.length !== rows.length) continue
    const mean = values.reduce((a, b) => a + b, 0) / values.length
    out[`${name}.mean`] = mean
    if (values.length > 1) {
      const variance = values.reduce((a, v) => a + (v - mean) * (v - mean), 0) / (values.length - 1)
      out[`${name}.stderr`] = Math.sqrt(variance / values.length)
    }
  }
  return out
}

/** log Z needs N, β, a and the convention from the ensemble: the closed forms are for V = a|x|². */
function partitionArgs(e: ComputeEnsemble, N: number, d: number, base: OptionValues): OptionValues {
  if (e.setting.beta === null || e.setting.beta === undefined) throw new EngineInputError(`ensemble ${e.id} declares no β; log Z needs one`)
  const potential = e.setting.potential ? withRecognisedPreset(parsePotential(e.setting.potential, { d })) : undefined
  if (potential?.preset?.name !== 'quadratic') throw new EngineInputError(`the exact log Z is known for V = a|x|²; ensemble ${e.id} declares V = ${e.setting.potential ?? 'none'}`)
  return { ...base, n: N, beta: e.setting.beta, a: potential.preset.a, convention: JSON.stringify(e.setting.convention), ensemble: base.ensemble ?? (d === 1 ? 'gaussian' : 'ginibre') }
}

/** Applies option defaults as the command line does. */
function parse(options: Array<{ name: string, default?: string | number | boolean }>, values: OptionValues): OptionValues {
  const out: OptionValues = { ...values }
  for (const o of options) if (out[o.name] === undefined && o.default !== undefined) out[o.name] = o.default
  return out
}

export default compute
