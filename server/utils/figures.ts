// Server rendering of figure specs: Vega-Lite → Vega → SVG with the headless 'none' renderer
// (no canvas), SVG → PNG with resvg, and SVG sized in points for a LaTeX column.
// resvg reads TrueType/OpenType files only (not woff2), so text needs a .ttf on disk: the
// DejaVu Sans files of the npm package dejavu-fonts-ttf when installed, else the system copies
// (Debian fonts-dejavu-core, Liberation). Only those files are loaded, never the whole system
// font set, so a PNG depends on the spec and these files alone.
import { existsSync } from 'node:fs'
import { createRequire } from 'node:module'
import { dirname, join } from 'node:path'
import { Resvg } from '@resvg/resvg-js'
import { parse, View } from 'vega'
import { compile, type TopLevelSpec } from 'vega-lite'

export interface FigureCompileResult {
  vega: ReturnType<typeof compile>['spec']
  warnings: string[]
}

/** Compiles a Vega-Lite spec, collecting the compiler's warnings instead of printing them. */
export function compileFigureSpec(spec: TopLevelSpec): FigureCompileResult {
  const warnings: string[] = []
  const collect = (...args: unknown[]) => {
    warnings.push(args.map(String).join(' '))
  }
  const logger = {
    level(): number {
      return 2
    },
    warn: collect,
    info: () => undefined,
    debug: () => undefined,
    error: collect,
  }
  const vega = compile(spec, { logger: logger as unknown as NonNullable<Parameters<typeof compile>[1]>['logger'] }).spec
  return { vega, warnings }
}

function withSize(spec: TopLevelSpec, size: { width?: number, height?: number }, fit: boolean): TopLevelSpec {
  const copy = { ...(spec as unknown as Record<string, unknown>) }
  if (size.width !== undefined) copy.width = size.width
  if (size.height !== undefined) copy.height = size.height
  if (fit) copy.autosize = { type: 'fit', contains: 'padding' }
  return copy as unknown as TopLevelSpec
}

/** vega numbers clip paths and gradients with process-wide counters; renumber them in order of
 * appearance so the same spec gives the same bytes whatever was rendered before. */
function stableIds(svg: string): string {
  const seen = new Map<string, string>()
  const counts = new Map<string, number>()
  return svg.replace(/(id="|url\(#|href="#)((?:clip|gradient|pattern)_?)(\d+)/g, (_m, lead: string, prefix: string, n: string) => {
    const key = prefix + n
    let mapped = seen.get(key)
    if (!mapped) {
      const next = (counts.get(prefix) ?? 0) + 1
      counts.set(prefix, next)
      mapped = `${prefix}${next}`
      seen.set(key, mapped)
    }
    return lead + mapped
  })
}

async function toSvg(spec: TopLevelSpec): Promise<string> {
  const { vega } = compileFigureSpec(spec)
  const view = new View(parse(vega), { renderer: 'none' })
  try {
    return stableIds(await view.toSVG())
  }
  finally {
    view.finalize()
  }
}

/** SVG of a figure; width and height (px) replace the spec's plot size when given. */
export async function renderFigureSvg(spec: TopLevelSpec, size: { width?: number, height?: number } = {}): Promise<string> {
  return toSvg(withSize(spec, size, false))
}

/** Font files resvg is given: the npm package's DejaVu Sans first, then system copies. */
export function figureFontFiles(): string[] {
  const found: string[] = []
  const roots: string[] = []
  try {
    const require = createRequire(import.meta.url)
    roots.push(dirname(require.resolve('dejavu-fonts-ttf/package.json')))
  }
  catch {
    // not resolvable from here (e.g. inside the bundled server): try the checkout's node_modules
  }
  roots.push(join(process.cwd(), 'node_modules', 'dejavu-fonts-ttf'))
  for (const root of roots) {
    for (const f of ['ttf/DejaVuSans.ttf', 'ttf/DejaVuSans-Bold.ttf']) {
      const file = join(root, f)
      if (existsSync(file) && !found.includes(file)) found.push(file)
    }
    if (found.length) break
  }
  const system = [
    '/usr/share/fonts/truetype/dejavu/DejaVuSans.ttf',
    '/usr/share/fonts/truetype/dejavu/DejaVuSans-Bold.ttf',
    '/usr/share/fonts/truetype/liberation/LiberationSans-Regular.ttf',
    '/usr/share/fonts/TTF/DejaVuSans.ttf',
  ]
  for (const f of system) {
    if (existsSync(f) && !found.some(g => g.endsWith(f.split('/').pop() as string))) found.push(f)
  }
  return found
}

export interface FigurePngOptions {
  /** Width of the figure in CSS px before scaling. */
  widthPx: number
  /** Pixel density (2 for a sharp image on high-density screens); the PNG is widthPx·scale pixels wide. */
  scale?: number
  fontFiles?: string[]
}

/** PNG bytes of an SVG figure, round(widthPx · scale) pixels wide. */
export function renderFigurePng(svg: string, options: FigurePngOptions): Buffer {
  const scale = options.scale ?? 1
  if (!(options.widthPx > 0) || !(scale > 0)) throw new Error(`renderFigurePng: width ${options.widthPx} px and scale ${scale} must be positive`)
  const fontFiles = options.fontFiles ?? figureFontFiles()
  if (fontFiles.length === 0) {
    throw new Error('renderFigurePng: no TrueType font found for the figure text; install the npm package dejavu-fonts-ttf or the Debian package fonts-dejavu-core')
  }
  const resvg = new Resvg(svg, {
    fitTo: { mode: 'width', value: Math.round(options.widthPx * scale) },
    font: { loadSystemFonts: false, fontFiles, defaultFontFamily: 'DejaVu Sans', sansSerifFamily: 'DejaVu Sans' },
    logLevel: 'off',
  })
  return resvg.render().asPng()
}

/** Column widths at 72 pt/in: single 3.5 in = 252 pt, double 7 in = 504 pt; height = width · 0.62. */
export const figureColumnSizes = {
  single: { widthPt: 252, heightPt: 156 },
  double: { widthPt: 504, heightPt: 312 },
} as const

/** SVG for a LaTeX column: the whole figure (axes and legend included) fits the column and the root
 * element carries its size in points, so it prints at 3.5 in or 7 in; text is set at 8–9 pt. */
export async function renderFigureForColumn(spec: TopLevelSpec, options: { column: 'single' | 'double' }): Promise<string> {
  const size = figureColumnSizes[options.column]
  if (!size) throw new Error(`renderFigureForColumn: column must be 'single' or 'double', got ${String(options.column)}`)
  const base = spec as unknown as Record<string, unknown>
  const config = (base.config ?? {}) as Record<string, Record<string, unknown>>
  const small: Record<string, unknown> = {
    ...config,
    axis: { ...config.axis, labelFontSize: 7, titleFontSize: 8 },
    legend: { ...config.legend, labelFontSize: 7, titleFontSize: 8, symbolSize: 30, columns: 1, labelLimit: size.widthPt - 40 },
    title: { ...config.title, fontSize: 9 },
    point: { ...config.point, size: 14 },
  }
  const sized = withSize({ ...base, config: small } as unknown as TopLevelSpec, { width: size.widthPt, height: size.heightPt }, true)
  const svg = await toSvg(sized)
  return svg.replace(/^<svg([^>]*?) width="([\d.]+)" height="([\d.]+)"/, (_m, pre: string, w: string, h: string) => `<svg${pre} width="${w}pt" height="${h}pt"`)
}
