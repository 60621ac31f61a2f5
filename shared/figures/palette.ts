// A quiet palette of our own for figures: ink on paper, slate greys for chrome, one oxblood
// accent. Series always differ by shape or dash as well as colour (never colour alone); the
// two-series pairing (slate blue / oxblood) differs in lightness too, so it survives the common
// colour-vision deficiencies and greyscale printing (common practice).
import type { Config } from 'vega-lite'

export const figureInk = {
  paper: '#fdfbf7',
  ink: '#211e1b',
  inkSoft: '#545254',
  inkFaint: '#7a797e',
  rule: '#dad4ca',
  oxblood: '#7a1f2b',
  slateBlue: '#35597a',
  ochre: '#8a5a00',
}

/** Series colours in order; each pairs with the shape and dash at the same index. */
export const seriesColours = [figureInk.slateBlue, figureInk.oxblood, figureInk.inkSoft, figureInk.ochre]
export const seriesShapes = ['circle', 'triangle-up', 'square', 'diamond']
export const seriesDashes: number[][] = [[1, 0], [6, 3], [2, 2], [8, 2, 2, 2]]

/** Sequential ramp for a per-point quantity: pale paper grey → slate → ink (monotone in lightness). */
export const sequentialRamp = ['#e4ded3', '#9a9aa3', figureInk.slateBlue, '#1c2a3a']

export const figureFont = '"Source Sans 3", "DejaVu Sans", "Liberation Sans", sans-serif'

export function figureConfig(): Config {
  return {
    background: figureInk.paper,
    font: figureFont,
    view: { stroke: figureInk.rule },
    axis: {
      domainColor: figureInk.inkFaint,
      gridColor: figureInk.rule,
      tickColor: figureInk.inkFaint,
      labelColor: figureInk.inkSoft,
      titleColor: figureInk.ink,
      titleFontWeight: 'normal',
      labelFontSize: 11,
      titleFontSize: 12,
    },
    legend: { labelColor: figureInk.inkSoft, titleColor: figureInk.ink, titleFontWeight: 'normal', labelLimit: 320 },
    title: { color: figureInk.ink, fontSize: 14, fontWeight: 'normal', anchor: 'start' },
    point: { filled: true, size: 36 },
    line: { strokeWidth: 1.5 },
  }
}
