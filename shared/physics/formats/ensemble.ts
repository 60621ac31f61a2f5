// The in-memory ensemble read from or written to a file: M configurations of N_m points in R^d,
// each stored flat (x0, y0, x1, y1, …), with per-configuration labels. For text and JSON input the
// 1-based file line of every point is kept, so that later checks can point back into the file.
import type { Configuration } from '../types'

export type EnsembleFormat = 'text' | 'json' | 'npy'
export type LabelValue = string | number

export interface PointEnsemble {
  /** Number of coordinates of every point. */
  d: number
  configurations: Configuration[]
  /** One record per configuration (may be empty), e.g. { N: 100, beta: 2, seed: 7 }. */
  labels: Array<Record<string, LabelValue>>
  format: EnsembleFormat
  /** Things worth telling the uploader that did not stop the reading. */
  warnings: string[]
  /** Name of the file read, when known (used in error locations). */
  fileName?: string
  /** For each configuration, the 1-based file line of each point (text and JSON input only). */
  pointLines?: Array<Int32Array | undefined>
}

/** Growable storage for the points of one configuration while a file is being read. */
export class PointBuffer {
  values: Float64Array
  lines: Int32Array
  count = 0

  constructor(readonly d: number, capacity = 256) {
    this.values = new Float64Array(capacity * d)
    this.lines = new Int32Array(capacity)
  }

  /** Reserves room for one more point read on `line`; returns the offset of its first coordinate. */
  add(line: number): number {
    if (this.count === this.lines.length) {
      const values = new Float64Array(this.values.length * 2)
      values.set(this.values)
      this.values = values
      const lines = new Int32Array(this.lines.length * 2)
      lines.set(this.lines)
      this.lines = lines
    }
    this.lines[this.count] = line
    return this.count++ * this.d
  }

  toConfiguration(): Configuration {
    return { N: this.count, d: this.d, points: this.values.slice(0, this.count * this.d) }
  }

  pointLines(): Int32Array {
    return this.lines.slice(0, this.count)
  }
}

/** True when the value is an ensemble rather than a single configuration. */
export function isEnsemble(value: Configuration | PointEnsemble): value is PointEnsemble {
  return 'configurations' in value
}
