// The result table every statistic returns: named columns, one record per bin (or point, or
// configuration), each value with its bootstrap error bar across configurations (Efron & Tibshirani,
// An Introduction to the Bootstrap, 1993, ch. 6 and 13), the parameters used, the configurations
// left out and why, and the engine version.
import type { Configuration } from '../types'
import { EngineInputError } from '../errors'
import { ENGINE_VERSION } from '../version'
import type { BootstrapOptions, BootstrapResult } from './bootstrap'

export type ParameterValue = number | string | boolean

export interface ColumnInfo {
  readonly name: string
  readonly description: string
}

export interface RejectedConfiguration {
  /** Index of the configuration within the ensemble (0-based). */
  readonly configuration: number
  readonly reason: string
}

export interface ErrorBarInfo {
  readonly method: 'percentile' | 'standard-error'
  readonly replicates: number
  /** Coverage of [lower, upper]. */
  readonly level: number
  /** Number of configurations resampled. */
  readonly configurations: number
}

export interface StatisticTable {
  readonly statistic: string
  readonly parameters: Record<string, ParameterValue>
  /** Geometry / window / convention the numbers refer to, in words. */
  readonly convention: string
  readonly columns: ColumnInfo[]
  readonly rows: Array<Record<string, number>>
  /** Whole-ensemble numbers (global order parameter, mean spacing, …). */
  readonly summary: Record<string, number>
  readonly errorBars: ErrorBarInfo
  readonly configurations: number
  readonly rejected: RejectedConfiguration[]
  readonly notes: string[]
  readonly engineVersion: string
}

/** Options shared by all statistics: how error bars are made. */
export interface ErrorBarOptions {
  /** Random numbers in [0, 1) for the resampling (seeded by the caller). */
  readonly uniform: () => number
  readonly replicates?: number
  readonly method?: 'percentile' | 'standard-error'
  readonly level?: number
}

export function bootstrapOptions(o: ErrorBarOptions): BootstrapOptions {
  return { uniform: o.uniform, replicates: o.replicates, method: o.method, level: o.level }
}

export function errorBarInfo(result: BootstrapResult, M: number): ErrorBarInfo {
  return { method: result.method, replicates: result.replicates, level: result.level, configurations: M }
}

export function makeTable(parts: Omit<StatisticTable, 'engineVersion'>): StatisticTable {
  return { ...parts, engineVersion: ENGINE_VERSION }
}

/** Checks a list of configurations of one dimension; returns d. */
export function checkConfigurations(configs: readonly Configuration[], what: string, dims?: readonly number[]): number {
  if (configs.length === 0) throw new EngineInputError(`${what}: no configurations given`)
  const d = configs[0].d
  if (dims && !dims.includes(d)) throw new EngineInputError(`${what}: points of dimension ${d} are not supported (supported: ${dims.join(', ')})`, { configuration: 0 })
  for (let m = 0; m < configs.length; m++) {
    const c = configs[m]
    if (c.d !== d) throw new EngineInputError(`${what}: configuration ${m} has dimension ${c.d}, the first has ${d}`, { configuration: m })
    if (c.points.length !== c.N * c.d) throw new EngineInputError(`${what}: configuration ${m} stores ${c.points.length} numbers for N = ${c.N} points of dimension ${c.d}`, { configuration: m })
    for (let k = 0; k < c.points.length; k++) {
      if (!Number.isFinite(c.points[k])) throw new EngineInputError(`${what}: coordinate ${k % d} of point ${Math.floor(k / d)} in configuration ${m} is not a finite number`, { configuration: m, index: Math.floor(k / d) })
    }
  }
  return d
}

export function checkPositive(value: number, name: string, what: string): void {
  if (!(value > 0) || !Number.isFinite(value)) throw new EngineInputError(`${what}: ${name} must be a finite number > 0 (got ${value})`)
}

export function checkBins(bins: number, what: string): void {
  if (!Number.isInteger(bins) || bins < 1 || bins > 100000) throw new EngineInputError(`${what}: the number of bins must be an integer between 1 and 100000 (got ${bins})`)
}
