// Pieces every figure template shares: column lookup with clear errors, the frame of a spec
// (schema, size, description, palette), tooltips from the table's column labels and the
// zoom/pan interval bound to the scales.
import type { TopLevelSpec } from 'vega-lite'
import { EngineInputError } from '../physics/errors'
import { figureConfig, seriesColours, seriesDashes, seriesShapes } from './palette'
import type { FigureFrameOptions, ResultColumn, ResultTable, TableValue } from './types'

export type Datum = Record<string, TableValue>

/** The layer shape our templates build (a subset of a Vega-Lite unit spec). */
export interface FigureLayer {
  name?: string
  mark: Record<string, unknown> & { type: string }
  encoding: Record<string, unknown>
  transform?: Array<Record<string, unknown>>
  params?: Array<Record<string, unknown>>
}

export interface FigureMeta {
  template: string
  /** Series labels in drawing order (observations first). */
  series: string[]
  [key: string]: unknown
}

export interface BuiltFigure {
  $schema: string
  title: string
  description: string
  width: number
  height: number
  data: { values: Datum[] }
  layer: FigureLayer[]
  usermeta: FigureMeta
  config: ReturnType<typeof figureConfig>
}

export const VEGA_LITE_SCHEMA = 'https://vega.github.io/schema/vega-lite/v6.json'

export function requireTables(template: string, tables: ResultTable[]): ResultTable[] {
  if (!Array.isArray(tables) || tables.length === 0) throw new EngineInputError(`figure ${template}: needs at least one result table`)
  return tables
}

export function hasColumn(table: ResultTable, name: string): boolean {
  return table.columns.some(c => c.name === name)
}

export function requireColumn(template: string, table: ResultTable, name: string): ResultColumn {
  const col = table.columns.find(c => c.name === name)
  if (!col) {
    const known = table.columns.map(c => c.name).join(', ')
    throw new EngineInputError(`figure ${template}: the table of computation ${table.computation} has no column '${name}' (it has: ${known})`)
  }
  return col
}

export function axisTitle(col: ResultColumn | undefined, fallback: string): string {
  if (!col) return fallback
  return col.unit ? `${col.label} (${col.unit})` : col.label
}

/** Finite number or undefined. */
export function num(v: TableValue | undefined): number | undefined {
  return typeof v === 'number' && Number.isFinite(v) ? v : undefined
}

export function tooltipFor(table: ResultTable, fields: string[]): Array<Record<string, unknown>> {
  return fields.filter(f => f === 'series' || f === 'revision' || hasColumn(table, f)).map((f) => {
    const col = table.columns.find(c => c.name === f)
    const isText = f === 'series' || f === 'revision'
    return isText
      ? { field: f, type: 'nominal', title: f === 'series' ? 'series' : 'revision' }
      : { field: f, type: 'quantitative', title: axisTitle(col, f), format: '.6~g' }
  })
}

/** Encodings that tell the series apart by colour and by shape or dash. */
export function seriesColour(series: string[]): Record<string, unknown> {
  return { field: 'series', type: 'nominal', scale: { domain: series, range: seriesColours.slice(0, series.length) }, legend: { title: null, orient: 'top' } }
}

/** Only the first series is drawn as points; the others are curves, shown in the legend as strokes. */
export function seriesShape(series: string[]): Record<string, unknown> {
  const range = series.map((_, i) => (i === 0 ? seriesShapes[0] : 'stroke'))
  return { field: 'series', type: 'nominal', scale: { domain: series, range }, legend: { title: null, orient: 'top' } }
}

export function seriesDash(series: string[]): Record<string, unknown> {
  return { field: 'series', type: 'nominal', scale: { domain: series, range: seriesDashes.slice(0, series.length) }, legend: { title: null, orient: 'top' } }
}

export function onlySeries(label: string): Array<Record<string, unknown>> {
  return [{ filter: { field: 'series', equal: label } }]
}

/** Zoom and pan: an interval selection bound to the scales (mouse wheel / drag). */
export function zoomParam(encodings: Array<'x' | 'y'> = ['x', 'y']): Record<string, unknown> {
  return { name: 'zoom', select: { type: 'interval', encodings }, bind: 'scales' }
}

export function frame(
  template: string,
  options: FigureFrameOptions,
  defaults: { title: string, width?: number, height?: number },
  description: string,
  values: Datum[],
  layer: FigureLayer[],
  meta: { series: string[], [key: string]: unknown },
): BuiltFigure {
  if (options.interactive !== false && layer.length > 0) {
    const first = layer[0]
    const encodings = (first.encoding.y === undefined ? ['x'] : ['x', 'y']) as Array<'x' | 'y'>
    first.params = [...(first.params ?? []), zoomParam(encodings)]
  }
  return {
    $schema: VEGA_LITE_SCHEMA,
    title: options.title ?? defaults.title,
    description,
    width: options.width ?? defaults.width ?? 420,
    height: options.height ?? defaults.height ?? 280,
    data: { values },
    layer,
    usermeta: { ...meta, template },
    config: figureConfig(),
  }
}

export function asSpec(figure: BuiltFigure): TopLevelSpec {
  return figure as unknown as TopLevelSpec
}

/** Format a number for a caption (6 significant figures). */
export function fmt(x: number): string {
  return Number.isInteger(x) ? String(x) : Number(x.toPrecision(6)).toString()
}

export function conventionOf(tables: ResultTable[]): string {
  const labels = [...new Set(tables.map(t => t.convention))]
  return labels.join('; ')
}
