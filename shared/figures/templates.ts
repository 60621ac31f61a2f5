// Figure templates of our own: each turns result tables into a Vega-Lite spec whose data are the
// table's rows (under the table's own field names) plus reference curves computed here:
// the finite-N expansion a + b·log N/N + c/N (least squares, ./fit), the Wigner surmise
// (Mehta, Random Matrices, 2004; ./wigner), the β = 2 bulk pair correlation 1 − exp(−πρr²)
// (Ginibre 1965; Forrester, Log-gases and Random Matrices, 2010, ch. 15) and the small-k
// Stillinger–Lovett law S(k) ≈ k²/(2πΓn) for the 2-D one-component plasma.
import type { TopLevelSpec } from 'vega-lite'
import { EngineInputError } from '../physics/errors'
import { CompensatedSum } from '../physics/summation'
import { evaluateExpansion, fitEnergyExpansion, type ExpansionFit } from './fit'
import {
  asSpec, axisTitle, conventionOf, fmt, frame, hasColumn, num, onlySeries, requireColumn, requireTables,
  seriesColour, seriesDash, seriesShape, tooltipFor, type Datum, type FigureLayer,
} from './frame'
import { figureInk, sequentialRamp } from './palette'
import type { FigureFrameOptions, ResultTable } from './types'
import { surmiseCurve, type SurmiseBeta } from './wigner'

function errorRule(x: string, lower: string, upper: string, series: string[], label: string): FigureLayer {
  return {
    name: 'error-bars',
    mark: { type: 'rule', strokeWidth: 1 },
    transform: [...onlySeries(label), { filter: `isValid(datum['${lower}']) && isValid(datum['${upper}'])` }],
    encoding: {
      x: { field: x, type: 'quantitative' },
      y: { field: lower, type: 'quantitative' },
      y2: { field: upper },
      color: seriesColour(series),
    },
  }
}

function pointLayer(table: ResultTable, x: string, y: string, series: string[], label: string, tooltip: string[], xAxis: Record<string, unknown>, yAxis: Record<string, unknown>): FigureLayer {
  return {
    name: 'observed',
    mark: { type: 'point', filled: true, tooltip: true },
    transform: onlySeries(label),
    encoding: {
      x: { field: x, type: 'quantitative', ...xAxis },
      y: { field: y, type: 'quantitative', ...yAxis },
      color: seriesColour(series),
      shape: seriesShape(series),
      tooltip: tooltipFor(table, ['series', ...tooltip]),
    },
  }
}

function lineLayer(table: ResultTable, x: string, y: string, series: string[], label: string, tooltip: string[]): FigureLayer {
  return {
    name: 'reference',
    mark: { type: 'line', tooltip: true, interpolate: 'linear' },
    transform: onlySeries(label),
    encoding: {
      x: { field: x, type: 'quantitative' },
      y: { field: y, type: 'quantitative' },
      color: seriesColour(series),
      strokeDash: seriesDash(series),
      tooltip: [{ field: 'series', type: 'nominal' }, ...tooltipFor(table, tooltip).filter(t => t.field !== 'series')],
    },
  }
}

function grid(lo: number, hi: number, points: number, log = false): number[] {
  const out: number[] = []
  for (let i = 0; i < points; i++) {
    const t = i / (points - 1)
    out.push(log ? Math.exp(Math.log(lo) + t * (Math.log(hi) - Math.log(lo))) : lo + t * (hi - lo))
  }
  return out
}

function errorFields(table: ResultTable, lower: string, upper: string): boolean {
  return hasColumn(table, lower) && hasColumn(table, upper)
}

// ─── next-order energy per point against N ───────────────────────────────────

export interface EnergyExpansionOptions extends FigureFrameOptions {
  nField?: string
  /** Column with the energy (default 'nextOrder', F_N). */
  valueField?: string
  /** Divide the value by N to plot the energy per point (default true). */
  perPoint?: boolean
  /** Logarithmic N axis (default true). */
  logN?: boolean
  /** Weight the fit by 1/σ² of the per-N means when every N has an error bar (default false). */
  weighted?: boolean
}

export function energyExpansionFigure(tables: ResultTable[], options: EnergyExpansionOptions = {}): TopLevelSpec {
  const id = 'energy-expansion'
  requireTables(id, tables)
  const nField = options.nField ?? 'N'
  const valueField = options.valueField ?? 'nextOrder'
  const perPoint = options.perPoint !== false
  const t0 = tables[0]
  for (const t of tables) {
    requireColumn(id, t, nField)
    requireColumn(id, t, valueField)
  }
  const groups = new Map<number, number[]>()
  tables.forEach((t, ti) => t.rows.forEach((r, i) => {
    const n = num(r[nField])
    const v = num(r[valueField])
    if (n === undefined || v === undefined) return
    if (!(n > 0)) throw new EngineInputError(`figure ${id}: N = ${n} is not positive (table ${ti}, row ${i})`, { index: i })
    const list = groups.get(n) ?? []
    list.push(perPoint ? v / n : v)
    groups.set(n, list)
  }))
  if (groups.size < 3) throw new EngineInputError(`figure ${id}: the fit needs at least three distinct N, the tables have ${groups.size}`)
  const observed = 'mean over configurations'
  const fitLabel = 'fit a + b·log N/N + c/N'
  const series = [observed, fitLabel]
  const Ns = [...groups.keys()].sort((a, b) => a - b)
  const values: Datum[] = []
  const means: number[] = []
  const errs: number[] = []
  for (const n of Ns) {
    const list = groups.get(n) ?? []
    const s = new CompensatedSum()
    for (const v of list) s.add(v)
    const mean = s.value / list.length
    const q = new CompensatedSum()
    for (const v of list) q.add((v - mean) * (v - mean))
    const se = list.length > 1 ? Math.sqrt(q.value / (list.length - 1) / list.length) : null
    means.push(mean)
    errs.push(se ?? 0)
    values.push({ series: observed, [nField]: n, [valueField]: mean, lower: se === null ? null : mean - se, upper: se === null ? null : mean + se, configurations: list.length })
  }
  const weights = options.weighted && errs.every(e => e > 0) ? errs.map(e => 1 / (e * e)) : undefined
  const fit: ExpansionFit = fitEnergyExpansion(Ns, means, weights)
  const logN = options.logN !== false
  for (const n of grid(Ns[0], Ns[Ns.length - 1], 80, logN)) values.push({ series: fitLabel, [nField]: n, [valueField]: evaluateExpansion(fit, n) })
  const nCol = t0.columns.find(c => c.name === nField)
  const vCol = t0.columns.find(c => c.name === valueField)
  const yTitle = perPoint ? `${axisTitle(vCol, valueField)} per point` : axisTitle(vCol, valueField)
  const xAxis = { title: axisTitle(nCol, nField), scale: logN ? { type: 'log', nice: false } : { zero: false } }
  const yAxis = { title: yTitle, scale: { zero: false } }
  const tips = [nField, valueField, 'lower', 'upper', 'configurations']
  const tooltipTable: ResultTable = { ...t0, columns: [...t0.columns.map(c => (c.name === valueField ? { ...c, label: yTitle, unit: undefined } : c)), { name: 'lower', label: 'mean − standard error' }, { name: 'upper', label: 'mean + standard error' }, { name: 'configurations', label: 'configurations' }] }
  const layer = [
    pointLayer(tooltipTable, nField, valueField, series, observed, tips, xAxis, yAxis),
    errorRule(nField, 'lower', 'upper', series, observed),
    lineLayer(tooltipTable, nField, valueField, series, fitLabel, [nField, valueField]),
  ]
  const description = `${yTitle} against ${axisTitle(nCol, nField)}: points are means over configurations at each N `
    + `with standard-error bars; the line is the ${weights ? 'weighted' : 'unweighted'} least-squares fit of the means to `
    + `a + b·log N/N + c/N, a = ${fmt(fit.a)}, b = ${fmt(fit.b)}, c = ${fmt(fit.c)} (${Ns.length} values of N). `
    + `Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Next-order energy per point against N' }, description, values, layer, { series, fit }))
}

// ─── spacing histogram against the Wigner surmise ────────────────────────────

export interface SpacingSurmiseOptions extends FigureFrameOptions {
  beta?: SurmiseBeta
  sField?: string
  lowField?: string
  highField?: string
  densityField?: string
  /** Bins when the table holds raw spacings instead of a histogram (default 30). */
  bins?: number
}

export function spacingSurmiseFigure(tables: ResultTable[], options: SpacingSurmiseOptions = {}): TopLevelSpec {
  const id = 'spacing-surmise'
  const [t] = requireTables(id, tables)
  const beta = options.beta ?? 2
  const sField = options.sField ?? 's'
  const lowField = options.lowField ?? 'sLow'
  const highField = options.highField ?? 'sHigh'
  const densityField = options.densityField ?? 'density'
  requireColumn(id, t, sField)
  const histogram = 'histogram'
  const surmise = `Wigner surmise β = ${beta}`
  const series = [histogram, surmise]
  const values: Datum[] = []
  let sMax = 0
  const binned = hasColumn(t, densityField) && hasColumn(t, lowField) && hasColumn(t, highField)
  if (binned) {
    for (const r of t.rows) {
      const hi = num(r[highField])
      if (hi === undefined || num(r[densityField]) === undefined) continue
      sMax = Math.max(sMax, hi)
      values.push({ ...r, series: histogram })
    }
  }
  else {
    const s = t.rows.map(r => num(r[sField])).filter((v): v is number => v !== undefined && v >= 0)
    if (s.length === 0) throw new EngineInputError(`figure ${id}: the table of computation ${t.computation} has no spacings`)
    const bins = options.bins ?? 30
    sMax = Math.max(3, ...s)
    const counts = new Float64Array(bins)
    for (const v of s) counts[Math.min(bins - 1, Math.floor((v / sMax) * bins))] += 1
    const w = sMax / bins
    counts.forEach((c, b) => values.push({ series: histogram, [lowField]: b * w, [highField]: (b + 1) * w, [sField]: (b + 0.5) * w, [densityField]: c / (s.length * w), count: c }))
  }
  sMax = Math.max(sMax, 3)
  for (const { s, p } of surmiseCurve(beta, sMax, 121)) values.push({ series: surmise, [sField]: s, [densityField]: p })
  const sCol = t.columns.find(c => c.name === sField)
  const dCol = t.columns.find(c => c.name === densityField)
  const bars: FigureLayer = {
    name: 'observed',
    mark: { type: 'rect', tooltip: true, opacity: 0.55, stroke: figureInk.paper, strokeWidth: 0.5 },
    transform: onlySeries(histogram),
    encoding: {
      x: { field: lowField, type: 'quantitative', title: axisTitle(sCol, 'spacing s') },
      x2: { field: highField },
      y: { field: densityField, type: 'quantitative', title: axisTitle(dCol, 'density') },
      y2: { datum: 0 },
      color: seriesColour(series),
      tooltip: [{ field: 'series', type: 'nominal' }, ...tooltipFor(t, [sField, lowField, highField, densityField, 'error', 'count'])],
    },
  }
  const layer: FigureLayer[] = [bars]
  if (errorFields(t, 'lower', 'upper')) layer.push(errorRule(sField, 'lower', 'upper', series, histogram))
  layer.push(lineLayer(t, sField, densityField, series, surmise, [sField, densityField]))
  const description = `Histogram of the unfolded nearest-neighbour spacings s (mean spacing 1)${layer.length > 2 ? ' with bootstrap error bars' : ''}, `
    + `against the Wigner surmise p_${beta}(s) (Mehta 2004). Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Spacing distribution against the Wigner surmise' }, description, values, layer, { series, beta }))
}

// ─── pair correlation against a reference ────────────────────────────────────

export interface PairCorrelationOptions extends FigureFrameOptions {
  rField?: string
  gField?: string
  /** Column with a reference g(r) (default 'reference', used when present). */
  referenceField?: string
  /** With beta = 2 and the density ρ, draws 1 − exp(−πρr²) when the table has no reference column. */
  beta?: number
  density?: number
}

export function pairCorrelationFigure(tables: ResultTable[], options: PairCorrelationOptions = {}): TopLevelSpec {
  const id = 'pair-correlation'
  const [t] = requireTables(id, tables)
  const rField = options.rField ?? 'r'
  const gField = options.gField ?? 'g'
  const refField = options.referenceField ?? 'reference'
  requireColumn(id, t, rField)
  requireColumn(id, t, gField)
  const observed = 'g(r), shell average'
  const values: Datum[] = t.rows.filter(r => num(r[rField]) !== undefined && num(r[gField]) !== undefined).map(r => ({ ...r, series: observed }))
  let reference: string | undefined
  if (hasColumn(t, refField) && t.rows.some(r => num(r[refField]) !== undefined)) {
    reference = t.columns.find(c => c.name === refField)?.label ?? 'reference'
    for (const r of t.rows) {
      const x = num(r[rField])
      const y = num(r[refField])
      if (x !== undefined && y !== undefined) values.push({ series: reference, [rField]: x, [gField]: y })
    }
  }
  else if (options.beta === 2 && options.density !== undefined) {
    const rho = options.density
    if (!(rho > 0)) throw new EngineInputError(`figure ${id}: the density ρ must be positive, got ${rho}`)
    reference = `β = 2: 1 − exp(−πρr²), ρ = ${fmt(rho)}`
    const rMax = Math.max(...values.map(v => num(v[rField]) ?? 0), 1e-12)
    for (const r of grid(0, rMax, 121)) values.push({ series: reference, [rField]: r, [gField]: -Math.expm1(-Math.PI * rho * r * r) })
  }
  const series = reference ? [observed, reference] : [observed]
  const rCol = t.columns.find(c => c.name === rField)
  const gCol = t.columns.find(c => c.name === gField)
  const layer: FigureLayer[] = [pointLayer(t, rField, gField, series, observed, [rField, gField, 'error', 'lower', 'upper'], { title: axisTitle(rCol, 'r') }, { title: axisTitle(gCol, 'g(r)') })]
  if (errorFields(t, 'lower', 'upper')) layer.push(errorRule(rField, 'lower', 'upper', series, observed))
  if (reference) layer.push(lineLayer(t, rField, gField, series, reference, [rField, gField]))
  const description = `Pair correlation g(r) (points${layer.some(l => l.name === 'error-bars') ? ', bootstrap error bars' : ''})`
    + (reference ? ` against ${reference}` : ' with no reference curve') + `. Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Pair correlation' }, description, values, layer, { series }))
}

// ─── structure factor on log axes ────────────────────────────────────────────

export interface StructureFactorOptions extends FigureFrameOptions {
  kField?: string
  sField?: string
  /** With the coupling Γ = β and the density n of a 2-D plasma, draws k²/(2πΓn). */
  coupling?: number
  density?: number
}

export function structureFactorFigure(tables: ResultTable[], options: StructureFactorOptions = {}): TopLevelSpec {
  const id = 'structure-factor'
  const [t] = requireTables(id, tables)
  const kField = options.kField ?? 'k'
  const sField = options.sField ?? 'S'
  requireColumn(id, t, kField)
  requireColumn(id, t, sField)
  const observed = 'S(k)'
  const values: Datum[] = []
  let dropped = 0
  for (const r of t.rows) {
    const k = num(r[kField])
    const s = num(r[sField])
    if (k === undefined || s === undefined || !(k > 0) || !(s > 0)) {
      dropped++
      continue
    }
    const lower = num(r.lower)
    values.push({ ...r, series: observed, lower: lower !== undefined && lower > 0 ? lower : null })
  }
  if (values.length === 0) throw new EngineInputError(`figure ${id}: no row of computation ${t.computation} has k > 0 and S > 0`)
  let reference: string | undefined
  if (options.coupling !== undefined && options.density !== undefined) {
    const G = options.coupling
    const n = options.density
    if (!(G > 0) || !(n > 0)) throw new EngineInputError(`figure ${id}: the coupling Γ and the density n must be positive`)
    reference = `k²/(2πΓn), Γ = ${fmt(G)}`
    const ks = values.map(v => num(v[kField]) ?? 1)
    for (const k of grid(Math.min(...ks), Math.max(...ks), 60, true)) values.push({ series: reference, [kField]: k, [sField]: (k * k) / (2 * Math.PI * G * n) })
  }
  const series = reference ? [observed, reference] : [observed]
  const kCol = t.columns.find(c => c.name === kField)
  const sCol = t.columns.find(c => c.name === sField)
  const layer: FigureLayer[] = [pointLayer(t, kField, sField, series, observed, [kField, sField, 'error', 'vectors'], { title: axisTitle(kCol, '|k|'), scale: { type: 'log' } }, { title: axisTitle(sCol, 'S(k)'), scale: { type: 'log' } })]
  if (errorFields(t, 'lower', 'upper')) layer.push(errorRule(kField, 'lower', 'upper', series, observed))
  if (reference) layer.push(lineLayer(t, kField, sField, series, reference, [kField, sField]))
  const description = `Structure factor S(k) = |Σ_j e^{ik·x_j}|²/N on logarithmic axes${reference ? `, with the small-k law ${reference} (Stillinger–Lovett)` : ''}`
    + `${dropped > 0 ? `; ${dropped} rows with k or S not positive are not drawn` : ''}. Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Structure factor' }, description, values, layer, { series, dropped }))
}

// ─── one configuration, points coloured by a per-point quantity ──────────────

export interface ConfigurationPointsOptions extends FigureFrameOptions {
  xField?: string
  /** Second coordinate; absent (or missing from the table) draws a 1-D strip. */
  yField?: string | null
  colorField?: string
  /** Which configuration to draw when the table has a 'configuration' column (default the first). */
  configuration?: number
}

export function configurationPointsFigure(tables: ResultTable[], options: ConfigurationPointsOptions = {}): TopLevelSpec {
  const id = 'configuration-points'
  const [t] = requireTables(id, tables)
  const xField = options.xField ?? 'x'
  requireColumn(id, t, xField)
  const yField = options.yField === null ? undefined : (options.yField ?? 'y')
  const twoD = yField !== undefined && hasColumn(t, yField)
  const colorField = options.colorField
  if (colorField) requireColumn(id, t, colorField)
  let rows = t.rows
  if (hasColumn(t, 'configuration')) {
    const which = options.configuration ?? num(rows[0]?.configuration) ?? 0
    rows = rows.filter(r => r.configuration === which)
    if (rows.length === 0) throw new EngineInputError(`figure ${id}: the table has no points of configuration ${which}`)
  }
  const points = 'points'
  const values: Datum[] = rows.filter(r => num(r[xField]) !== undefined && (!twoD || num(r[yField as string]) !== undefined)).map(r => ({ ...r, series: points }))
  const xCol = t.columns.find(c => c.name === xField)
  const colour = colorField
    ? { field: colorField, type: 'quantitative', scale: { range: sequentialRamp }, legend: { title: axisTitle(t.columns.find(c => c.name === colorField), colorField), orient: 'right' } }
    : { value: figureInk.slateBlue }
  const tips = tooltipFor(t, ['index', xField, ...(twoD ? [yField as string] : []), ...(colorField ? [colorField] : [])])
  let layer: FigureLayer[]
  let size: { width: number, height: number }
  if (twoD) {
    const xs = values.map(v => num(v[xField]) ?? 0)
    const ys = values.map(v => num(v[yField as string]) ?? 0)
    const lo = Math.min(...xs, ...ys)
    const hi = Math.max(...xs, ...ys)
    const pad = (hi - lo) * 0.04 || 1
    const domain = [lo - pad, hi + pad]
    layer = [{
      name: 'observed',
      mark: { type: 'point', filled: true, tooltip: true, size: 22, shape: 'circle', stroke: figureInk.ink, strokeWidth: 0.3 },
      encoding: {
        x: { field: xField, type: 'quantitative', title: axisTitle(xCol, xField), scale: { domain, nice: false } },
        y: { field: yField, type: 'quantitative', title: axisTitle(t.columns.find(c => c.name === yField), yField as string), scale: { domain, nice: false } },
        color: colour,
        tooltip: tips,
      },
    }]
    size = { width: 360, height: 360 }
  }
  else {
    layer = [{
      name: 'observed',
      mark: { type: 'tick', tooltip: true, thickness: 1.5 },
      encoding: {
        x: { field: xField, type: 'quantitative', title: axisTitle(xCol, xField), scale: { zero: false } },
        color: colour,
        tooltip: tips,
      },
    }]
    size = { width: 480, height: 60 }
  }
  const description = `${twoD ? 'A configuration of' : 'A 1-D configuration of'} ${values.length} points`
    + `${colorField ? `, each coloured by ${axisTitle(t.columns.find(c => c.name === colorField), colorField)} (light to dark)` : ''}`
    + `${twoD ? '; equal scales on both axes' : ', drawn as a strip'}. Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Configuration', ...size }, description, values, layer, { series: [points], dimension: twoD ? 2 : 1 }))
}

// ─── empirical against equilibrium density ───────────────────────────────────

export interface DensityComparisonOptions extends FigureFrameOptions {
  xField?: string
  densityField?: string
  equilibriumField?: string
}

export function densityComparisonFigure(tables: ResultTable[], options: DensityComparisonOptions = {}): TopLevelSpec {
  const id = 'density-comparison'
  const [t] = requireTables(id, tables)
  const xField = options.xField ?? 'x'
  const dField = options.densityField ?? 'density'
  const eField = options.equilibriumField ?? 'equilibrium'
  requireColumn(id, t, xField)
  requireColumn(id, t, dField)
  requireColumn(id, t, eField)
  const empirical = 'empirical'
  const equilibrium = 'equilibrium measure'
  const series = [empirical, equilibrium]
  const values: Datum[] = []
  for (const r of t.rows) {
    const x = num(r[xField])
    if (x === undefined) continue
    if (num(r[dField]) !== undefined) values.push({ ...r, series: empirical })
    const e = num(r[eField])
    if (e !== undefined) values.push({ series: equilibrium, [xField]: x, [dField]: e })
  }
  const xCol = t.columns.find(c => c.name === xField)
  const dCol = t.columns.find(c => c.name === dField)
  const layer: FigureLayer[] = [pointLayer(t, xField, dField, series, empirical, [xField, dField, 'error', eField], { title: axisTitle(xCol, 'x') }, { title: axisTitle(dCol, 'density') })]
  if (errorFields(t, 'lower', 'upper')) layer.push(errorRule(xField, 'lower', 'upper', series, empirical))
  layer.push(lineLayer(t, xField, dField, series, equilibrium, [xField, dField]))
  const description = `Empirical density (points${layer.length > 2 ? ' with bootstrap error bars' : ''}) against the bin-averaged `
    + `equilibrium density μ_V (line). Convention: ${conventionOf(tables)}.`
  return asSpec(frame(id, options, { title: 'Empirical against equilibrium density' }, description, values, layer, { series }))
}

export { overlay } from './overlay'

// ─── the registry the interface lists templates from ─────────────────────────

export interface TemplateParameter {
  name: string
  label: string
  kind: 'number' | 'string' | 'boolean' | 'choice'
  default?: number | string | boolean
  choices?: Array<number | string>
}

export interface FigureTemplate {
  id: string
  title: string
  /** Catalogue ids of the quantities whose tables the template draws. */
  quantities: string[]
  parameters: TemplateParameter[]
  build: (tables: ResultTable[], options?: Record<string, unknown>) => TopLevelSpec
}

const frameParameters: TemplateParameter[] = [
  { name: 'title', label: 'Title', kind: 'string' },
  { name: 'width', label: 'Width of the plot area (px)', kind: 'number', default: 420 },
  { name: 'height', label: 'Height of the plot area (px)', kind: 'number', default: 280 },
]

export const figureTemplates: FigureTemplate[] = [
  {
    id: 'energy-expansion',
    title: 'Next-order energy per point against N, with the fitted expansion a + b·log N/N + c/N',
    quantities: ['next-order', 'energy'],
    parameters: [
      { name: 'valueField', label: 'Column', kind: 'choice', default: 'nextOrder', choices: ['nextOrder', 'normalisedNextOrder', 'H'] },
      { name: 'perPoint', label: 'Divide by N', kind: 'boolean', default: true },
      { name: 'logN', label: 'Logarithmic N axis', kind: 'boolean', default: true },
      { name: 'weighted', label: 'Weight the fit by the error bars', kind: 'boolean', default: false },
      ...frameParameters,
    ],
    build: (tables, options) => energyExpansionFigure(tables, options as EnergyExpansionOptions),
  },
  {
    id: 'spacing-surmise',
    title: 'Spacing histogram against the Wigner surmise',
    quantities: ['statistic:spacing'],
    parameters: [{ name: 'beta', label: 'β of the surmise', kind: 'choice', default: 2, choices: [1, 2, 4] }, ...frameParameters],
    build: (tables, options) => spacingSurmiseFigure(tables, options as SpacingSurmiseOptions),
  },
  {
    id: 'pair-correlation',
    title: 'Pair correlation against a reference curve',
    quantities: ['statistic:pair-correlation'],
    parameters: [
      { name: 'beta', label: 'β (2 draws 1 − exp(−πρr²) when the table has no reference)', kind: 'number' },
      { name: 'density', label: 'Density ρ', kind: 'number' },
      ...frameParameters,
    ],
    build: (tables, options) => pairCorrelationFigure(tables, options as PairCorrelationOptions),
  },
  {
    id: 'structure-factor',
    title: 'Structure factor on logarithmic axes',
    quantities: ['statistic:structure-factor'],
    parameters: [
      { name: 'coupling', label: 'Coupling Γ for the small-k law', kind: 'number' },
      { name: 'density', label: 'Density n', kind: 'number' },
      ...frameParameters,
    ],
    build: (tables, options) => structureFactorFigure(tables, options as StructureFactorOptions),
  },
  {
    id: 'configuration-points',
    title: 'A configuration, points coloured by a per-point quantity',
    quantities: ['statistic:psi6', 'statistic:voronoi'],
    parameters: [
      { name: 'colorField', label: 'Colour by column', kind: 'string', default: 'abs' },
      { name: 'configuration', label: 'Configuration (0-based)', kind: 'number', default: 0 },
      ...frameParameters,
    ],
    build: (tables, options) => configurationPointsFigure(tables, options as ConfigurationPointsOptions),
  },
  {
    id: 'density-comparison',
    title: 'Empirical against equilibrium density',
    quantities: ['statistic:density'],
    parameters: [...frameParameters],
    build: (tables, options) => densityComparisonFigure(tables, options as DensityComparisonOptions),
  },
]

export function findFigureTemplate(id: string): FigureTemplate | undefined {
  return figureTemplates.find(t => t.id === id)
}
