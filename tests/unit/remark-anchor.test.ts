// Remark anchors: their validation, their description in words, and the pins layered into a
// Vega-Lite spec (layering as the Vega-Lite documentation describes it: a top-level "layer" array
// whose views may carry their own "data"; https://vega.github.io/vega-lite/docs/layer.html).
import { describe, expect, it } from 'vitest'
import { axisFieldsFor, axisNames, describeAnchor, pinnedLabel, remarkCreateSchema, specWithPins } from '../../shared/utils/remarks'
import { fieldErrors } from '../../shared/utils/validation'

function fieldsOf(input: unknown): Record<string, string> {
  const result = remarkCreateSchema.safeParse(input)
  return result.success ? {} : fieldErrors(result.error)
}

describe('remark anchors', () => {
  it('accepts the three kinds of anchor', () => {
    expect(fieldsOf({ figureNumber: 1, anchor: { kind: 'figure' }, body: 'ok' })).toEqual({})
    expect(fieldsOf({ figureNumber: 1, anchor: { kind: 'datum', x: 400, y: -1.5, series: 'mean', row: 3 }, body: 'ok' })).toEqual({})
    expect(fieldsOf({ figureNumber: 1, anchor: { kind: 'region', x0: 0, x1: 1, y0: -1, y1: 1 }, body: 'ok' })).toEqual({})
  })

  it('gives one message per bad field: inverted region edges, missing numbers, an unknown kind, the body', () => {
    expect(Object.keys(fieldsOf({ figureNumber: 1, anchor: { kind: 'region', x0: 2, x1: 1, y0: 0, y1: 0 }, body: 'ok' })).sort()).toEqual(['anchor.x1', 'anchor.y1'])
    expect(Object.keys(fieldsOf({ figureNumber: 1, anchor: { kind: 'datum', x: Number.NaN }, body: 'ok' })).sort()).toEqual(['anchor.x', 'anchor.y'])
    expect(Object.keys(fieldsOf({ figureNumber: 1, anchor: { kind: 'datum', x: Number.POSITIVE_INFINITY, y: 1 }, body: 'ok' }))).toEqual(['anchor.x'])
    expect(Object.keys(fieldsOf({ figureNumber: 1, anchor: { kind: 'circle' }, body: 'ok' }))).toEqual(['anchor.kind'])
    expect(Object.keys(fieldsOf({ figureNumber: 0, anchor: { kind: 'figure' }, body: ' ' })).sort()).toEqual(['body', 'figureNumber'])
    expect(Object.keys(fieldsOf({ figureNumber: 1, anchor: { kind: 'figure' }, body: 'x'.repeat(5001) }))).toEqual(['body'])
  })

  it('describes anchors with the axes\' names and four significant figures', () => {
    expect(describeAnchor({ kind: 'datum', x: 400, y: 1.234567 }, { x: 'N', y: 'E' })).toBe('at N = 400, E = 1.235')
    expect(pinnedLabel({ kind: 'figure' })).toBe('Pinned to the whole figure')
    expect(pinnedLabel({ kind: 'region', x0: 0.1, x1: 0.25, y0: 0.9, y1: 1.1 }, { x: 'r', y: 'g' })).toBe('Pinned to the region r from 0.1 to 0.25, g from 0.9 to 1.1')
  })
})

describe('pins in a spec', () => {
  const spec = {
    data: { values: [{ r: 0.1, g: 0.9, series: 'observed' }] },
    layer: [{ name: 'observed', mark: 'point', encoding: { x: { field: 'r', type: 'quantitative', title: 'r' }, y: { field: 'g', type: 'quantitative', title: 'g(r)' } } }],
  }

  it('adds a diamond layer for data and a rectangle layer for regions, with the axes\' titles, leaving the spec itself alone', () => {
    const drawn = specWithPins(spec, [{ id: 1, anchor: { kind: 'datum', x: 0.1, y: 0.9 } }, { id: 2, anchor: { kind: 'region', x0: 0, x1: 0.2, y0: 0.5, y1: 1 } }, { id: 3, anchor: { kind: 'figure' } }]) as unknown as { layer: Array<{ name: string, data?: { values: Array<Record<string, number>> }, encoding: { x: { title?: string } } }> }
    expect(spec.layer).toHaveLength(1)
    expect(drawn.layer.map(l => l.name)).toEqual(['observed', 'remarkpinsregion', 'remarkpins'])
    expect(drawn.layer[1]!.data!.values).toEqual([{ pin: 2, rx0: 0, rx1: 0.2, ry0: 0.5, ry1: 1, current: 0 }])
    expect(drawn.layer[2]!.data!.values).toEqual([{ pin: 1, px: 0.1, py: 0.9, current: 0 }])
    expect(drawn.layer[2]!.encoding.x.title).toBe('r')
  })

  it('turns a single view into a layer, and leaves a spec without pins as it is', () => {
    const single = { data: { values: [] }, mark: 'point', encoding: { x: { field: 'a' }, y: { field: 'b' } } }
    const drawn = specWithPins(single, [{ id: 1, anchor: { kind: 'datum', x: 1, y: 2 } }]) as unknown as { mark?: unknown, layer: unknown[] }
    expect(drawn.mark).toBeUndefined()
    expect(drawn.layer).toHaveLength(2)
    expect(specWithPins(spec, [{ id: 1, anchor: { kind: 'figure' } }])).toBe(spec)
  })

  it('finds the axes\' names and the clicked layer\'s fields', () => {
    expect(axisNames(spec)).toEqual({ x: 'r', y: 'g(r)' })
    expect(axisFieldsFor(spec, 'observed_marks', { r: 0.1, g: 0.9 })).toEqual({ x: 'r', y: 'g' })
    expect(axisFieldsFor(spec, 'observed_marks', { r: 'a' })).toBeNull()
  })
})
