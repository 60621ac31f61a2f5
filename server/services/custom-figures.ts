// Figures from the author's own Vega-Lite spec. Its data are named `computation-<id>` and are
// replaced by that computation's result rows; nothing may be fetched from elsewhere (no `url`).
import { compile } from 'vega-lite'
import type { TopLevelSpec } from 'vega-lite'
import type { ResultTable } from '#shared/figures/types'

const MAX_BYTES = 100_000

function walk(value: unknown, visit: (node: Record<string, unknown>, path: string) => void, path = 'spec'): void {
  if (Array.isArray(value)) value.forEach((v, i) => walk(v, visit, `${path}[${i}]`))
  else if (value && typeof value === 'object') {
    visit(value as Record<string, unknown>, path)
    for (const [k, v] of Object.entries(value)) walk(v, visit, `${path}.${k}`)
  }
}

/** Checks a custom spec: size, no external data, only data named after the figure's computations, and that Vega-Lite compiles it. */
export function checkCustomSpec(spec: Record<string, unknown>, computationIds: number[]): void {
  const problem = (message: string) => createError({ statusCode: 422, statusMessage: message, data: { fields: { spec: message } } })
  if (JSON.stringify(spec).length > MAX_BYTES) throw problem(`A custom spec has at most ${MAX_BYTES} characters.`)
  const allowed = new Set(computationIds.map(id => `computation-${id}`))
  walk(spec, (node, path) => {
    if ('url' in node) throw problem(`${path}.url: a figure draws only stored results; name a computation as data instead (data: {"name": "computation-<id>"}).`)
    if (path.endsWith('.data') && typeof node.name === 'string' && !allowed.has(node.name)) throw problem(`${path}.name: "${node.name}" is not one of ${[...allowed].join(', ')}.`)
  })
  try {
    compile(spec as unknown as TopLevelSpec)
  }
  catch (error) {
    throw problem(`Vega-Lite cannot read the spec: ${error instanceof Error ? error.message : String(error)}`)
  }
}

/** The spec with every named computation's rows put in place, and a description naming the conventions. */
export function bindCustomSpec(spec: Record<string, unknown>, tables: Array<ResultTable & { id: number }>): TopLevelSpec {
  const bound = structuredClone(spec)
  walk(bound, (node, path) => {
    if (!path.endsWith('.data') || typeof node.name !== 'string') return
    const table = tables.find(t => `computation-${t.id}` === node.name)
    if (table) {
      delete node.name
      node.values = table.rows
    }
  })
  const conventions = [...new Set(tables.map(t => t.convention))].join(' | ')
  return { ...bound, description: `${typeof bound.description === 'string' ? `${bound.description} ` : ''}Convention: ${conventions}; engine ${tables[0]?.engineVersion ?? ''}.` } as unknown as TopLevelSpec
}
