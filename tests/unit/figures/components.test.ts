// Server-side render of the figure components: each SFC is compiled with @vue/compiler-sfc (the
// auto-imported Vue functions made explicit), children registered by name as Nuxt would.
import { describe, it, expect, beforeAll, afterAll } from 'vitest'
import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join } from 'node:path'
import { fileURLToPath } from 'node:url'
import { compileScript, parse } from '@vue/compiler-sfc'
import { createSSRApp, h, type Component } from 'vue'
import { renderToString } from 'vue/server-renderer'
import { densityComparisonFigure } from '../../../shared/figures'
import type { ResultTable } from '../../../shared/figures/types'
import { densityTable } from './tables'

const dir = fileURLToPath(new URL('../../../app/components/figure/', import.meta.url))
const out = mkdtempSync(join(tmpdir(), 'qf-figure-'))
const names = ['FigureStatusWord', 'FigureLiveChart', 'FigureDataTable', 'FigurePlate'] as const
const components: Partial<Record<(typeof names)[number], Component>> = {}

async function load(name: (typeof names)[number]): Promise<Component> {
  const source = readFileSync(join(dir, `${name}.vue`), 'utf8')
  const { descriptor, errors } = parse(source, { filename: `${name}.vue` })
  expect(errors).toEqual([])
  const script = compileScript(descriptor, { id: name, inlineTemplate: true })
  const file = join(out, `${name}.ts`)
  writeFileSync(file, `import { ref, computed, watch, onMounted, onBeforeUnmount, useId } from 'vue'\n${script.content}`)
  return (await import(/* @vite-ignore */ file)).default as Component
}

async function render(root: Component, props: Record<string, unknown>): Promise<string> {
  const app = createSSRApp({ render: () => h(root, props) })
  for (const n of names) app.component(n, components[n] as Component)
  return renderToString(app)
}

beforeAll(async () => {
  for (const n of names) components[n] = await load(n)
})

afterAll(() => {
  rmSync(out, { recursive: true, force: true })
})

describe('figure components (server render)', () => {
  const table: ResultTable = densityTable()

  it('status word: a word and its own glyph for each status', async () => {
    const glyphs = new Set<string>()
    for (const word of ['current', 'queued', 'drifted', 'failed'] as const) {
      const html = await render(components.FigureStatusWord as Component, { status: { word } })
      expect(html).toContain(`data-testid="figure-status-${word}"`)
      expect(html).toContain(`<span>${word}</span>`)
      const glyph = /<span aria-hidden="true">([^<]+)<\/span>/.exec(html)?.[1]
      expect(glyph).toBeTruthy()
      glyphs.add(glyph as string)
    }
    expect(glyphs.size).toBe(4)
  })

  it('data table: column headers with units, one row per table row', async () => {
    const html = await render(components.FigureDataTable as Component, { table, caption: 'Data of figure 2' })
    expect((html.match(/<th scope="col"/g) ?? []).length).toBe(table.columns.length)
    expect(html).toContain('x<span class="text-ink-faint"> (rescaled)</span>')
    expect((html.match(/<tr class="border-b border-rule\/50"/g) ?? []).length).toBe(table.rows.length)
    expect(html).toContain('<caption')
  })

  it('plate: number, caption, convention and engine line, status word, data toggle, server SVG', async () => {
    const spec = densityComparisonFigure([table])
    const html = await render(components.FigurePlate as Component, {
      number: 3, spec, tables: [table], status: { word: 'drifted', detail: 'off by 2%' }, svg: '<svg id="server-svg"></svg>',
      downloads: [{ label: 'SVG, single column', href: '/f/3.svg' }],
    })
    expect(html).toContain('data-testid="figure-plate-3"')
    expect(html).toContain('Figure 3.')
    expect(html).toContain(spec.description as string)
    expect(html).toContain('Convention: canonical: log kernel, d = 2 · engine 0.1.0')
    expect(html).toContain('data-testid="figure-status-drifted"')
    expect(html).toContain('aria-expanded="false"')
    expect(html).toContain('<svg id="server-svg"></svg>')
    expect(html).toContain('href="/f/3.svg"')
    expect(html).toContain('data-testid="figure-data-table"')
  })
})
