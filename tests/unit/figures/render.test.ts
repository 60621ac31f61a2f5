import { describe, it, expect } from 'vitest'
import type { TopLevelSpec } from 'vega-lite'
import { configurationPointsFigure, spacingSurmiseFigure, structureFactorFigure } from '../../../shared/figures'
import { figureInk } from '../../../shared/figures/palette'
import {
  figureColumnSizes, figureFontFiles, renderFigureForColumn, renderFigurePng, renderFigureSvg,
} from '../../../server/utils/figures'
import { decodePng, PNG_MAGIC } from './png'
import { configurationTable, spacingTable, structureTable } from './tables'

function withTitleColour(spec: TopLevelSpec, colour: string): TopLevelSpec {
  const s = spec as unknown as { config: { title: Record<string, unknown> } }
  return { ...s, config: { ...s.config, title: { ...s.config.title, color: colour } } } as unknown as TopLevelSpec
}

describe('SVG rendering', () => {
  it('is the same string for the same spec', async () => {
    const spec = spacingSurmiseFigure([spacingTable()])
    expect(await renderFigureSvg(spec)).toBe(await renderFigureSvg(spacingSurmiseFigure([spacingTable()])))
  })

  it('does not depend on what was rendered before (clip and gradient ids)', async () => {
    const spec = configurationPointsFigure([configurationTable(20, true)], { colorField: 'abs' })
    const first = await renderFigureSvg(spec)
    await renderFigureSvg(structureFactorFigure([structureTable()]))
    expect(await renderFigureSvg(spec)).toBe(first)
    expect(first).toContain('url(#gradient_1)')
  })

  it('takes the plot size from the options', async () => {
    const small = await renderFigureSvg(structureFactorFigure([structureTable()]), { width: 200, height: 120 })
    const large = await renderFigureSvg(structureFactorFigure([structureTable()]), { width: 600, height: 400 })
    const width = (svg: string) => Number(/<svg[^>]* width="([\d.]+)"/.exec(svg)?.[1])
    expect(width(large) - width(small)).toBeCloseTo(400, 0)
  })
})

describe('PNG rendering', () => {
  it('finds a TrueType font for the text', () => {
    expect(figureFontFiles().length).toBeGreaterThan(0)
  })

  it('gives a PNG of the requested width, the same bytes twice', async () => {
    const svg = await renderFigureSvg(spacingSurmiseFigure([spacingTable()]))
    const png = renderFigurePng(svg, { widthPx: 480 })
    expect([...png.subarray(0, 8)]).toEqual(PNG_MAGIC)
    expect(decodePng(png).width).toBe(480)
    expect(decodePng(renderFigurePng(svg, { widthPx: 480, scale: 2 })).width).toBe(960)
    expect(renderFigurePng(svg, { widthPx: 480 }).equals(png)).toBe(true)
    expect(() => renderFigurePng(svg, { widthPx: 0 })).toThrow(/positive/)
  })

  it('draws the title text: pixels differ from an invisible title only in the title band', async () => {
    const spec = spacingSurmiseFigure([spacingTable()], { title: 'Spacings of the unfolded spectrum' })
    const visible = decodePng(renderFigurePng(await renderFigureSvg(spec), { widthPx: 500 }))
    // Same layout, title drawn in the background colour: only glyph pixels can change.
    const hidden = decodePng(renderFigurePng(await renderFigureSvg(withTitleColour(spec, figureInk.paper)), { widthPx: 500 }))
    expect(hidden.height).toBe(visible.height)
    const svg = await renderFigureSvg(spec)
    // The title sits above the plot: its band is the top of the image, 24 px at this size.
    expect(svg).toContain('Spacings of the unfolded spectrum')
    let inBand = 0
    let outside = 0
    let dark = 0
    for (let y = 0; y < visible.height; y++) {
      for (let x = 0; x < visible.width; x++) {
        const i = (y * visible.width + x) * 4
        const differs = visible.pixels[i] !== hidden.pixels[i] || visible.pixels[i + 1] !== hidden.pixels[i + 1] || visible.pixels[i + 2] !== hidden.pixels[i + 2]
        if (!differs) continue
        if (y < 24) inBand++
        else outside++
        if (y < 24 && visible.pixels[i] < 100) dark++
      }
    }
    expect(inBand).toBeGreaterThan(200)
    expect(dark).toBeGreaterThan(50)
    expect(outside).toBe(0)
  })
})

describe('SVG for a LaTeX column', () => {
  it('is 3.5 in (252 pt) or 7 in (504 pt) wide, sized in points, and deterministic', async () => {
    // 72 pt per inch (common practice for PostScript/PDF points).
    expect(figureColumnSizes.single.widthPt).toBe(3.5 * 72)
    expect(figureColumnSizes.double.widthPt).toBe(7 * 72)
    const spec = spacingSurmiseFigure([spacingTable()])
    const single = await renderFigureForColumn(spec, { column: 'single' })
    const double = await renderFigureForColumn(spec, { column: 'double' })
    expect(single).toMatch(/^<svg[^>]* width="252pt" height="156pt" viewBox="0 0 252 156"/)
    expect(double).toMatch(/^<svg[^>]* width="504pt" height="312pt" viewBox="0 0 504 312"/)
    expect(await renderFigureForColumn(spec, { column: 'single' })).toBe(single)
    expect(single).toContain('font-size="7px"')
  })
})
