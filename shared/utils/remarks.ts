// Remarks on figures: the schemas shared by the forms and the handlers, how an anchor is described
// in words, and how pins are layered into a figure's Vega-Lite spec (a marker at a datum, a
// rectangle for a region) so that they follow the chart's zoom and pan.
import { z } from 'zod'
import { figureInk } from '../figures/palette'

export type RemarkPinAnchor
  = | { kind: 'figure' }
    | { kind: 'datum', x: number, y: number, series?: string, row?: number }
    | { kind: 'region', x0: number, x1: number, y0: number, y1: number }

export const REMARK_STATE_VALUES = ['open', 'settled'] as const
export type RemarkState = typeof REMARK_STATE_VALUES[number]

const coordinate = (name: string) => z.number({ message: `Give ${name} as a number.` })
  .refine(v => Number.isFinite(v), { message: `${name} must be a finite number.` })

export const remarkAnchorSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('figure') }),
  z.object({
    kind: z.literal('datum'),
    x: coordinate('x'),
    y: coordinate('y'),
    series: z.string().trim().max(200, 'A series name has at most 200 characters.').optional(),
    row: z.number().int('A row is a whole number.').min(0, 'A row is not negative.').optional(),
  }),
  z.object({
    kind: z.literal('region'),
    x0: coordinate('x0'),
    x1: coordinate('x1'),
    y0: coordinate('y0'),
    y1: coordinate('y1'),
  }).superRefine((r, ctx) => {
    if (Number.isFinite(r.x0) && Number.isFinite(r.x1) && !(r.x0 < r.x1)) ctx.addIssue({ code: 'custom', path: ['x1'], message: 'The region\'s right edge x1 must be greater than its left edge x0.' })
    if (Number.isFinite(r.y0) && Number.isFinite(r.y1) && !(r.y0 < r.y1)) ctx.addIssue({ code: 'custom', path: ['y1'], message: 'The region\'s top edge y1 must be greater than its bottom edge y0.' })
  }),
], { message: 'Pin the remark to the whole figure, a datum or a region.' })

export const remarkBodySchema = z.string({ message: 'Write the remark.' }).trim()
  .min(1, 'Write the remark.')
  .max(5000, 'A remark has at most 5000 characters.')

export const remarkCreateSchema = z.object({
  figureNumber: z.number({ message: 'Choose a figure.' }).int('Choose a figure by its number.').positive('Choose a figure by its number.'),
  anchor: remarkAnchorSchema,
  body: remarkBodySchema,
})

export const remarkReplySchema = z.object({ body: remarkBodySchema })

export const remarkStateSchema = z.object({
  state: z.enum(REMARK_STATE_VALUES, { message: 'A remark is open or settled.' }),
})

export const remarkListQuerySchema = z.object({
  figure: z.coerce.number({ message: 'A figure is given by its number.' }).int().positive('A figure is given by its number.').optional(),
  state: z.enum(REMARK_STATE_VALUES, { message: 'Filter by open or settled.' }).optional(),
})

export const mailStopSchema = z.object({
  key: z.string({ message: 'The link has no key.' }).trim().min(1, 'The link has no key.').max(64, 'That key is too long.'),
})

export type RemarkCreateInput = z.infer<typeof remarkCreateSchema>

/** "Pinned at r = 0.12, g = 1.02", "Pinned to the whole figure", "Pinned to the region …". */
export function pinnedLabel(anchor: RemarkPinAnchor, axes?: { x: string, y: string }): string {
  return `Pinned ${anchor.kind === 'datum' ? '' : 'to '}${describeAnchor(anchor, axes)}`
}

/** A number for an anchor's description: four significant figures, integers as they are. */
export function anchorNumber(v: number): string {
  if (Number.isInteger(v) && Math.abs(v) < 1e9) return String(v)
  return Number(v.toPrecision(4)).toString()
}

/** The anchor in words, with the axes' names: "at r = 0.12, g = 1.02", "the region r from 0.1 to 0.2, g from 0.9 to 1.1". */
export function describeAnchor(anchor: RemarkPinAnchor, axes: { x: string, y: string } = { x: 'x', y: 'y' }): string {
  if (anchor.kind === 'figure') return 'the whole figure'
  if (anchor.kind === 'datum') {
    const where = `at ${axes.x} = ${anchorNumber(anchor.x)}, ${axes.y} = ${anchorNumber(anchor.y)}`
    return anchor.series ? `${where} (${anchor.series})` : where
  }
  return `the region ${axes.x} from ${anchorNumber(anchor.x0)} to ${anchorNumber(anchor.x1)}, ${axes.y} from ${anchorNumber(anchor.y0)} to ${anchorNumber(anchor.y1)}`
}

interface Encoding { field?: string, title?: unknown }
interface LayerLike { name?: string, encoding?: { x?: Encoding, y?: Encoding }, layer?: LayerLike[] }

function firstLayerWithAxes(spec: LayerLike): LayerLike | undefined {
  if (spec.encoding?.x?.field) return spec
  for (const l of spec.layer ?? []) {
    const found = firstLayerWithAxes(l)
    if (found) return found
  }
  return undefined
}

/** The axes' names of a figure's spec (their titles, else their fields). */
export function axisNames(spec: unknown): { x: string, y: string } {
  const layer = firstLayerWithAxes((spec ?? {}) as LayerLike)
  const name = (e: Encoding | undefined, fallback: string) => typeof e?.title === 'string' && e.title ? e.title : e?.field ?? fallback
  return { x: name(layer?.encoding?.x, 'x'), y: name(layer?.encoding?.y, 'y') }
}

/** The x and y fields of the layer a clicked mark belongs to (by its mark name), else of the first layer that has both. */
export function axisFieldsFor(spec: unknown, markName: string | undefined, datum: Record<string, unknown>): { x: string, y: string } | null {
  const layers: LayerLike[] = []
  const walk = (l: LayerLike) => {
    layers.push(l)
    for (const c of l.layer ?? []) walk(c)
  }
  walk((spec ?? {}) as LayerLike)
  const usable = layers.filter(l => l.encoding?.x?.field && l.encoding?.y?.field && typeof datum[l.encoding.x.field] === 'number' && typeof datum[l.encoding.y.field!] === 'number')
  const named = usable.find(l => l.name && markName === `${l.name}_marks`)
  const layer = named ?? usable[0]
  return layer ? { x: layer.encoding!.x!.field!, y: layer.encoding!.y!.field! } : null
}

export interface RemarkPin {
  id: number
  anchor: RemarkPinAnchor
  /** Drawn with the accent (the remark being looked at) or quietly. */
  current?: boolean
}

/** The name of the pins' marks in the drawn chart (vega adds "_marks"). */
export const PIN_LAYER = 'remarkpins'

/**
 * The spec with the pins as extra layers: a diamond at each datum, an outlined rectangle for each
 * region. The extra layers share the first layer's axis titles so that the axes keep their names.
 * Specs that are neither a single view nor a layer (concatenations, facets) are left as they are.
 */
export function specWithPins<T>(spec: T, pins: RemarkPin[], colour: string = figureInk.oxblood): T {
  const drawn = pins.filter(p => p.anchor.kind !== 'figure')
  if (!drawn.length || !spec || typeof spec !== 'object') return spec
  const s = spec as Record<string, unknown>
  let base: Record<string, unknown>
  if (Array.isArray(s.layer)) {
    base = { ...s, layer: [...(s.layer as unknown[])] }
  }
  else if (s.mark) {
    const { mark, encoding, params, transform, ...rest } = s
    base = { ...rest, layer: [{ mark, encoding, ...(params ? { params } : {}), ...(transform ? { transform } : {}) }] }
  }
  else {
    return spec
  }
  const axes = firstLayerWithAxes(base as LayerLike)
  const xTitle = axes?.encoding?.x?.title
  const yTitle = axes?.encoding?.y?.title
  const titled = (t: unknown) => (t === undefined ? {} : { title: t })
  const points = drawn.flatMap(p => p.anchor.kind === 'datum' ? [{ pin: p.id, px: p.anchor.x, py: p.anchor.y, current: p.current ? 1 : 0 }] : [])
  const regions = drawn.flatMap(p => p.anchor.kind === 'region' ? [{ pin: p.id, rx0: p.anchor.x0, rx1: p.anchor.x1, ry0: p.anchor.y0, ry1: p.anchor.y1, current: p.current ? 1 : 0 }] : [])
  const layers = base.layer as unknown[]
  if (regions.length) {
    layers.push({
      name: `${PIN_LAYER}region`,
      data: { values: regions },
      mark: { type: 'rect', fill: colour, fillOpacity: 0.08, stroke: colour, strokeWidth: 1.5, strokeDash: [4, 3] },
      encoding: {
        x: { field: 'rx0', type: 'quantitative', ...titled(xTitle) },
        x2: { field: 'rx1' },
        y: { field: 'ry0', type: 'quantitative', ...titled(yTitle) },
        y2: { field: 'ry1' },
        strokeWidth: { condition: { test: 'datum.current', value: 3 }, value: 1.5 },
        tooltip: [{ field: 'pin', type: 'nominal', title: 'remark' }],
      },
    })
  }
  if (points.length) {
    layers.push({
      name: PIN_LAYER,
      data: { values: points },
      mark: { type: 'point', shape: 'diamond', filled: false, stroke: colour, strokeWidth: 2, size: 260 },
      encoding: {
        x: { field: 'px', type: 'quantitative', ...titled(xTitle) },
        y: { field: 'py', type: 'quantitative', ...titled(yTitle) },
        size: { condition: { test: 'datum.current', value: 420 }, value: 260 },
        tooltip: [{ field: 'pin', type: 'nominal', title: 'remark' }],
      },
    })
  }
  return base as T
}

/** A person as the remark routes show them (already through the naming rule). */
export interface RemarkPersonJson {
  userId: string | null
  name: string
  role: string | null
  anonymous: boolean
  self: boolean
}

/** A thread as the remark routes answer it. */
export interface RemarkThreadJson {
  id: number
  figureNumber: number
  revision: string
  anchor: RemarkPinAnchor
  state: RemarkState
  createdAt: string
  updatedAt: string
  settledAt: string | null
  author: RemarkPersonJson
  settledBy: RemarkPersonJson | null
  messages: Array<{ id: number, body: string, createdAt: string, author: RemarkPersonJson }>
  canSettle: boolean
  canReply: boolean
}
