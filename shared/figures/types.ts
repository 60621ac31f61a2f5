// The tables a computation hands to the figure builders, and the status a figure carries.
// Plain data: everything here serialises to JSON unchanged.

export type TableValue = number | string | null

export interface ResultColumn {
  name: string
  label: string
  unit?: string
}

export interface ResultTable {
  /** Id of the computation that produced the table. */
  computation: string
  /** Quantity computed (catalogue id, e.g. 'spacings'). */
  quantity: string
  columns: ResultColumn[]
  /** One row per configuration, bin or point. */
  rows: Array<Record<string, TableValue>>
  /** Whole-ensemble rows (means with error bars, one per N, …). */
  aggregates?: Array<Record<string, TableValue>>
  /** Human label of the convention the numbers refer to. */
  convention: string
  engineVersion: string
  inputHash: string
}

export type FigureStatusWord = 'current' | 'queued' | 'drifted' | 'failed'

export interface FigureStatus {
  word: FigureStatusWord
  detail?: string
}

/** Options every template accepts. */
export interface FigureFrameOptions {
  title?: string
  /** Plot area in px (the renderer may override for a column size). */
  width?: number
  height?: number
  /** Adds the zoom/pan interval bound to the scales (default true). */
  interactive?: boolean
}
