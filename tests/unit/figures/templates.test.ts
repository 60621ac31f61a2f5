import { describe, it, expect } from 'vitest'
import type { TopLevelSpec } from 'vega-lite'
import {
  captionLine, configurationPointsFigure, densityComparisonFigure, energyExpansionFigure, figureTemplates, overlay,
  pairCorrelationFigure, spacingSurmiseFigure, structureFactorFigure,
} from '../../../shared/figures'
import type { BuiltFigure } from '../../../shared/figures/frame'
import type { ResultTable } from '../../../shared/figures/types'
import { EngineInputError } from '../../../shared/physics/errors'
import { compileFigureSpec, renderFigureSvg } from '../../../server/utils/figures'
import { configurationTable, densityTable, nextOrderTable, pairTable, spacingTable, structureTable } from './tables'
import { ariaLabels, countTags, markGroup } from './svg'

const built = (spec: TopLevelSpec) => spec as unknown as BuiltFigure
const seriesRows = (spec: TopLevelSpec, label: string) => built(spec).data.values.filter(v => v.series === label)

async function renderClean(spec: TopLevelSpec): Promise<string> {
  const { warnings } = compileFigureSpec(spec)
  expect(warnings).toEqual([])
  return renderFigureSvg(spec)
}

describe('energy per point against N with the fitted expansion', () => {
  const coef = { a: -0.5, b: 0.25, c: 1.25 }

  it('fits the per-N means and recovers exact coefficients to 1e-10', () => {
    const spec = energyExpansionFigure([nextOrderTable(coef, [10, 20, 40, 80, 160, 320])])
    const fit = built(spec).usermeta.fit as { a: number, b: number, c: number }
    expect(Math.abs(fit.a - coef.a)).toBeLessThan(1e-10)
    expect(Math.abs(fit.b - coef.b)).toBeLessThan(1e-10)
    expect(Math.abs(fit.c - coef.c)).toBeLessThan(1e-10)
    expect(spec.description).toContain('a + b·log N/N + c/N')
  })

  it('draws one point and one error bar per N and the fit as one line', async () => {
    const noise = (i: number) => 1e-3 * Math.sin(1 + i)
    const spec = energyExpansionFigure([nextOrderTable(coef, [10, 20, 40, 80, 160], 3, noise)])
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(5)
    expect(countTags(markGroup(svg, 'rule', 'error_bars'), 'line')).toBe(5)
    expect(countTags(markGroup(svg, 'line', 'reference'), 'path')).toBe(1)
    // The mean energy per point at N = 10 over three configurations, recomputed here.
    const mean10 = [0, 1, 2].map(i => coef.a + (coef.b * Math.log(10)) / 10 + coef.c / 10 + noise(i)).reduce((x, y) => x + y) / 3
    const point = seriesRows(spec, 'mean over configurations').find(r => r.N === 10)
    expect(point?.nextOrder).toBeCloseTo(mean10, 14)
    expect(ariaLabels(svg).some(l => l.startsWith('N: 10;'))).toBe(true)
  })

  it('says which column and N are missing', () => {
    const t = nextOrderTable(coef, [10, 20, 40])
    expect(() => energyExpansionFigure([t], { valueField: 'H' })).toThrow(/no column 'H'/)
    expect(() => energyExpansionFigure([nextOrderTable(coef, [10, 20])])).toThrow(EngineInputError)
    expect(() => energyExpansionFigure([])).toThrow(/at least one result table/)
  })
})

describe('spacing histogram against the Wigner surmise', () => {
  it('carries the surmise curve from the formulas of Mehta, Random Matrices (2004)', () => {
    const spec = spacingSurmiseFigure([spacingTable()], { beta: 2 })
    const curve = seriesRows(spec, 'Wigner surmise β = 2')
    const at1 = curve.find(r => r.s === 1)
    expect(at1?.density).toBeCloseTo((32 / Math.PI ** 2) * Math.exp(-4 / Math.PI), 14)
    for (const r of curve) {
      const s = r.s as number
      expect(r.density).toBeCloseTo((32 / Math.PI ** 2) * s * s * Math.exp((-4 * s * s) / Math.PI), 14)
    }
    const gue = spacingSurmiseFigure([spacingTable()], { beta: 1 })
    const p1 = seriesRows(gue, 'Wigner surmise β = 1').find(r => r.s === 1)
    expect(p1?.density).toBeCloseTo((Math.PI / 2) * Math.exp(-Math.PI / 4), 14)
  })

  it('renders one bar per bin, error bars and the curve', async () => {
    const svg = await renderClean(spacingSurmiseFigure([spacingTable()]))
    expect(countTags(markGroup(svg, 'rect', 'observed'), 'path')).toBe(12)
    expect(countTags(markGroup(svg, 'rule', 'error_bars'), 'line')).toBe(12)
    expect(countTags(markGroup(svg, 'line', 'reference'), 'path')).toBe(1)
    expect(svg).toContain('Wigner surmise β = 2')
  })

  it('bins raw spacings into a density that integrates to 1', async () => {
    const raw: ResultTable = { ...spacingTable(), columns: [{ name: 's', label: 'spacing' }], rows: Array.from({ length: 200 }, (_, i) => ({ s: (i + 0.5) / 100 })) }
    const spec = spacingSurmiseFigure([raw], { bins: 20 })
    const bars = seriesRows(spec, 'histogram')
    expect(bars).toHaveLength(20)
    const mass = bars.reduce((acc, b) => acc + (b.density as number) * ((b.sHigh as number) - (b.sLow as number)), 0)
    expect(mass).toBeCloseTo(1, 12)
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'rect', 'observed'), 'path')).toBe(20)
  })
})

describe('pair correlation against a reference', () => {
  it('computes 1 − exp(−πρr²) for β = 2 when the table has no reference column', async () => {
    const spec = pairCorrelationFigure([pairTable(false)], { beta: 2, density: 0.5 })
    // β = 2 bulk reference g(r) = 1 − exp(−πρr²) (Ginibre 1965), recomputed here.
    const ref = seriesRows(spec, 'β = 2: 1 − exp(−πρr²), ρ = 0.5')
    expect(ref.length).toBeGreaterThan(50)
    for (const r of ref) expect(r.g).toBeCloseTo(1 - Math.exp(-Math.PI * 0.5 * (r.r as number) ** 2), 14)
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(10)
    expect(countTags(markGroup(svg, 'line', 'reference'), 'path')).toBe(1)
  })

  it('uses the reference column of the table when present', async () => {
    const spec = pairCorrelationFigure([pairTable(true)])
    expect(seriesRows(spec, 'Poisson process').map(r => r.g)).toEqual(Array(10).fill(1))
    const svg = await renderClean(spec)
    expect(svg).toContain('Poisson process')
  })
})

describe('structure factor on log axes', () => {
  it('drops rows that a log axis cannot show and draws the small-k law', async () => {
    const spec = structureFactorFigure([structureTable()], { coupling: 2, density: 1 })
    expect(built(spec).usermeta.dropped).toBe(1)
    // Stillinger–Lovett small-k law S(k) ≈ k²/(2πΓn) (Stillinger & Lovett, J. Chem. Phys. 49, 1968), Γ = 2, n = 1.
    for (const r of seriesRows(spec, 'k²/(2πΓn), Γ = 2')) expect(r.S).toBeCloseTo(((r.k as number) ** 2) / (4 * Math.PI), 14)
    const { vega } = compileFigureSpec(spec)
    const types = (vega.scales ?? []).filter(s => s.name === 'x' || s.name === 'y').map(s => s.type)
    expect(types).toEqual(['log', 'log'])
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(8)
    expect(countTags(markGroup(svg, 'rule', 'error_bars'), 'line')).toBe(8)
  })
})

describe('a configuration coloured by a per-point quantity', () => {
  it('draws the chosen configuration of a 2-D table as points with equal scales', async () => {
    const spec = configurationPointsFigure([configurationTable(30, true)], { colorField: 'abs' })
    const layer = built(spec).layer[0]
    const x = layer.encoding.x as { scale: { domain: number[] } }
    const y = layer.encoding.y as { scale: { domain: number[] } }
    expect(x.scale.domain).toEqual(y.scale.domain)
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(30)
    expect(svg).toContain('|ψ₆|')
  })

  it('draws a 1-D table as a strip of ticks', async () => {
    const spec = configurationPointsFigure([configurationTable(25, false)], { colorField: 'abs' })
    expect(built(spec).usermeta.dimension).toBe(1)
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'rect', 'observed'), 'path')).toBe(25)
  })
})

describe('empirical against equilibrium density', () => {
  it('draws points with error bars and the equilibrium as a line', async () => {
    const spec = densityComparisonFigure([densityTable()])
    const eq = seriesRows(spec, 'equilibrium measure')
    expect(eq.map(r => r.density)).toEqual(densityTable().rows.map(r => r.equilibrium))
    const svg = await renderClean(spec)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(10)
    expect(countTags(markGroup(svg, 'rule', 'error_bars'), 'line')).toBe(10)
    expect(countTags(markGroup(svg, 'line', 'reference'), 'path')).toBe(1)
    expect(svg).toContain('x (rescaled)')
  })
})

describe('overlay of two revisions', () => {
  it('keeps the rows of both revisions and tells them apart by colour and shape', async () => {
    const a = pairCorrelationFigure([pairTable(false)], { beta: 2, density: 1 })
    const tableB = pairTable(false)
    tableB.rows = tableB.rows.slice(0, 7)
    const b = pairCorrelationFigure([tableB], { beta: 2, density: 1 })
    const o = overlay(a, b, ['revision 1', 'revision 2'])
    const values = built(o).data.values
    expect(values.filter(v => v.revision === 'revision 1')).toHaveLength(built(a).data.values.length)
    expect(values.filter(v => v.revision === 'revision 2')).toHaveLength(built(b).data.values.length)
    const points = built(o).layer[0]
    expect((points.encoding.color as { field: string }).field).toBe('revision')
    expect((points.encoding.shape as { field: string }).field).toBe('revision')
    const svg = await renderClean(o)
    expect(countTags(markGroup(svg, 'symbol', 'observed'), 'path')).toBe(17)
    expect(svg).toContain('revision 1')
    expect(svg).toContain('revision 2')
  })

  it('refuses specs of different templates, custom specs and equal labels', () => {
    const a = pairCorrelationFigure([pairTable(true)])
    const d = densityComparisonFigure([densityTable()])
    expect(() => overlay(a, d, ['1', '2'])).toThrow(/different templates/)
    expect(() => overlay(a, a, ['1', '1'])).toThrow(/two different/)
    const custom = { mark: 'point', data: { values: [] } } as unknown as TopLevelSpec
    expect(() => overlay(custom, a, ['1', '2'])).toThrow(EngineInputError)
  })
})

describe('registry and common frame', () => {
  const tablesFor: Record<string, ResultTable[]> = {
    'energy-expansion': [nextOrderTable({ a: 1, b: 1, c: 1 }, [10, 20, 40])],
    'spacing-surmise': [spacingTable()],
    'pair-correlation': [pairTable(true)],
    'structure-factor': [structureTable()],
    'configuration-points': [configurationTable(12, true)],
    'density-comparison': [densityTable()],
  }

  it('lists each template once, with quantities, parameters and a working builder', () => {
    expect(new Set(figureTemplates.map(t => t.id)).size).toBe(figureTemplates.length)
    expect(figureTemplates.map(t => t.id).sort()).toEqual(Object.keys(tablesFor).sort())
    for (const t of figureTemplates) {
      expect(t.quantities.length).toBeGreaterThan(0)
      const spec = built(t.build(tablesFor[t.id] ?? []))
      expect(spec.description.length).toBeGreaterThan(40)
      expect(spec.description).toContain('Convention: canonical: log kernel, d = 2')
      expect(spec.usermeta.template).toBe(t.id)
      // zoom/pan bound to the scales on the first layer; tooltips on the marks
      expect(spec.layer[0].params?.some(p => p.bind === 'scales')).toBe(true)
      expect(spec.layer[0].mark.tooltip).toBe(true)
      expect(Array.isArray(spec.layer[0].encoding.tooltip)).toBe(true)
      expect(compileFigureSpec(t.build(tablesFor[t.id] ?? [])).warnings).toEqual([])
    }
  })

  it('can leave out the zoom', () => {
    const spec = built(densityComparisonFigure([densityTable()], { interactive: false }))
    expect(spec.layer[0].params).toBeUndefined()
  })
})

describe('caption line', () => {
  it('names the convention, the engine and the status in words', () => {
    const t = densityTable()
    expect(captionLine(t, { word: 'current' })).toBe('Convention: canonical: log kernel, d = 2 · engine 0.1.0 · status: current')
    expect(captionLine([t, { ...t, engineVersion: '0.2.0' }], { word: 'drifted', detail: 'differs from the declared values by 3%' }))
      .toBe('Convention: canonical: log kernel, d = 2 · engine 0.1.0, 0.2.0 · status: drifted (differs from the declared values by 3%)')
  })
})
