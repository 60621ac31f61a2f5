// GET /files/<slug>/figures/<n>?format=svg|png|single|double — the figure rendered by the server:
// SVG, PNG, or a vector SVG sized for one or two LaTeX columns.
import { z } from 'zod'
import { drawFigure, findFigure } from '../../../../services/figures'

const query = z.object({ format: z.enum(['svg', 'png', 'single', 'double'], { message: 'The format is svg, png, single or double.' }).default('svg') })

export default defineEventHandler(async (event) => {
  const { slug, number } = readParamsWith(event, figureParams)
  const { format } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  const figure = await findFigure(companion.id, number)
  const drawn = await drawFigure(figure)
  if (!drawn.spec) throw createError({ statusCode: 409, statusMessage: `Figure ${number} cannot be drawn yet: ${drawn.status.detail ?? drawn.status.word}.` })
  const name = `${companion.slug}-figure-${number}`
  if (format === 'png') {
    const svg = await renderFigureSvg(drawn.spec)
    setResponseHeaders(event, { 'Content-Type': 'image/png', 'Content-Disposition': `inline; filename="${name}.png"` })
    return renderFigurePng(svg, { widthPx: 1200 })
  }
  const svg = format === 'svg' ? await renderFigureSvg(drawn.spec) : await renderFigureForColumn(drawn.spec, { column: format })
  setResponseHeaders(event, { 'Content-Type': 'image/svg+xml; charset=utf-8', 'Content-Disposition': `inline; filename="${name}${format === 'svg' ? '' : `-${format}-column`}.svg"` })
  return svg
})
