// Two revisions of one figure in one plot: the rows of both specs, each tagged with a
// `revision` field, drawn by the first spec's layers with colour and shape (points) or dash
// (lines) keyed to the revision, so the two never differ by colour alone.
import type { TopLevelSpec } from 'vega-lite'
import { EngineInputError } from '../physics/errors'
import type { BuiltFigure, Datum, FigureLayer } from './frame'
import { seriesColours, seriesDashes, seriesShapes } from './palette'

function asBuilt(spec: TopLevelSpec, which: string): BuiltFigure {
  const s = spec as unknown as Partial<BuiltFigure>
  if (!s || typeof s !== 'object' || !s.data || !Array.isArray(s.data.values) || !Array.isArray(s.layer)) {
    throw new EngineInputError(`overlay: ${which} spec is not a layered figure with inline data (build it from a figure template)`)
  }
  return s as BuiltFigure
}

export function overlay(specA: TopLevelSpec, specB: TopLevelSpec, labels: [string, string]): TopLevelSpec {
  const a = asBuilt(specA, 'the first')
  const b = asBuilt(specB, 'the second')
  if (labels.length !== 2 || labels[0] === labels[1]) throw new EngineInputError('overlay: give two different revision labels')
  if (a.usermeta?.template !== b.usermeta?.template) {
    throw new EngineInputError(`overlay: the specs come from different templates (${String(a.usermeta?.template)} and ${String(b.usermeta?.template)})`)
  }
  const domain = [...labels]
  const scale = (range: unknown[]) => ({ domain, range })
  const legend = { title: 'revision', orient: 'top' }
  const colour = { field: 'revision', type: 'nominal', scale: scale(seriesColours.slice(0, 2)), legend }
  const values: Datum[] = [
    ...a.data.values.map(v => ({ ...v, revision: labels[0] })),
    ...b.data.values.map(v => ({ ...v, revision: labels[1] })),
  ]
  const layer: FigureLayer[] = a.layer.map((l) => {
    const encoding: Record<string, unknown> = { ...l.encoding, color: colour }
    const mark = { ...l.mark }
    if (mark.type === 'point') {
      delete mark.shape
      encoding.shape = { field: 'revision', type: 'nominal', scale: scale(seriesShapes.slice(0, 2)), legend }
    }
    if (mark.type === 'line') encoding.strokeDash = { field: 'revision', type: 'nominal', scale: scale(seriesDashes.slice(0, 2)), legend }
    if (mark.type === 'rect' || mark.type === 'bar') {
      // the first revision filled, the second drawn as outlines
      delete mark.opacity
      mark.strokeWidth = 1.5
      encoding.stroke = colour
      encoding.fillOpacity = { field: 'revision', type: 'nominal', scale: scale([0.45, 0]), legend }
    }
    if (Array.isArray(encoding.tooltip)) encoding.tooltip = [{ field: 'revision', type: 'nominal', title: 'revision' }, ...encoding.tooltip]
    return { ...l, mark, encoding, params: l.params?.map(p => ({ ...p })) }
  })
  const out: BuiltFigure = {
    ...a,
    title: `${a.title}: ${labels[0]} and ${labels[1]}`,
    description: `Two revisions overlaid: ${labels[0]} (slate blue, circles, solid lines, filled bars) and ${labels[1]} (oxblood, triangles, dashed lines, outlined bars). ${a.description}`,
    data: { values },
    layer,
    usermeta: { ...a.usermeta, overlay: { revisions: domain, descriptions: [a.description, b.description] } },
  }
  return out as unknown as TopLevelSpec
}
