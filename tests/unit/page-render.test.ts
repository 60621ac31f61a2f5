// The companion page renderer: math against the reference library (katex.renderToString), the
// XSS vectors of common practice (OWASP XSS filter evasion cheat sheet), directives and GFM tables.
import katex from 'katex'
import { parseFragment, serialize } from 'parse5'
import { describe, expect, it } from 'vitest'
import { PAGE_KATEX_OPTIONS, pageReferences, renderPage } from '../../shared/page/render'

/** The same HTML as the WHATWG parser (parse5) reads it back: only serialisation details differ. */
const normal = (html: string) => serialize(parseFragment(html))

interface Found { tag: string, attrs: Array<{ name: string, value: string }> }
function elementsOf(html: string): Found[] {
  const out: Found[] = []
  const walk = (node: { nodeName: string, tagName?: string, attrs?: Found['attrs'], childNodes?: unknown[] }) => {
    if (node.tagName) out.push({ tag: node.tagName, attrs: node.attrs ?? [] })
    for (const child of node.childNodes ?? []) walk(child as typeof node)
  }
  walk(parseFragment(html) as unknown as Parameters<typeof walk>[0])
  return out
}
const htmlOf = (source: string) => renderPage(source).blocks.map(b => (b.kind === 'html' ? b.html : '')).join('\n')

describe('math (reference library: katex.renderToString)', () => {
  // A log-gas energy with quadratic confinement, as written in manuscripts of the field.
  const energy = 'H_N = -\\sum_{1 \\le i < j \\le N} \\log|x_i - x_j| + \\frac{N}{2} \\sum_{i=1}^{N} x_i^2'

  it('sets inline $…$ exactly as KaTeX does', () => {
    const { blocks, problems } = renderPage(`The energy is $${energy}$.`)
    expect(problems).toEqual([])
    expect(blocks).toHaveLength(1)
    const expected = `<p>The energy is ${katex.renderToString(energy, { ...PAGE_KATEX_OPTIONS, displayMode: false })}.</p>`
    expect(normal((blocks[0] as { html: string }).html)).toBe(normal(expected))
  })

  it('sets display $$…$$ exactly as KaTeX does in display mode', () => {
    const tex = '\\lim_{N\\to\\infty} \\frac{1}{N^2} H_N = \\iint \\log\\frac{1}{|x-y|}\\,d\\mu(x)\\,d\\mu(y)'
    const { blocks } = renderPage(`$$\n${tex}\n$$`)
    expect(blocks).toHaveLength(1)
    expect(normal((blocks[0] as { html: string }).html)).toBe(normal(katex.renderToString(tex, { ...PAGE_KATEX_OPTIONS, displayMode: true })))
  })

  it('shows broken math in a visible error span and reports its line', () => {
    const { blocks, problems } = renderPage('First line.\n\nBroken: $\\frac{1}{$ here.')
    const html = (blocks[0] as { html: string }).html
    expect(html).toContain('class="katex-error"')
    expect(html).toContain('\\frac{1}{')
    expect(problems).toHaveLength(1)
    expect(problems[0]!.line).toBe(3)
  })

  it('sets a ```math fence in display mode and reports its errors too', () => {
    const { blocks } = renderPage('```math\n\\sum_{i=1}^N x_i\n```')
    expect(normal((blocks[0] as { html: string }).html)).toBe(normal(katex.renderToString('\\sum_{i=1}^N x_i\n', { ...PAGE_KATEX_OPTIONS, displayMode: true })))
    expect(renderPage('Text.\n\n```math\n\\frac{1}{\n```').problems.map(p => p.line)).toEqual([3])
  })

  it('refuses \\href and \\url inside math (trust: false)', () => {
    const html = htmlOf('$\\href{javascript:alert(1)}{x}$ and $\\url{http://example.com}$')
    expect(elementsOf(html).filter(e => e.tag === 'a')).toEqual([])
  })
})

describe('unsafe input (common practice: OWASP XSS filter evasion cheat sheet)', () => {
  const vectors: Array<[string, string]> = [
    ['script tag', '<script>alert(1)</script>'],
    ['script tag inside a paragraph', 'Before <script>alert(1)</script> after'],
    ['img with onerror', '<img src=x onerror=alert(1)>'],
    ['javascript: link', '[x](javascript:alert(1))'],
    ['javascript: link with entity-encoded colon', '[x](javascript&#58;alert(1))'],
    ['javascript: link in mixed case', '[x](JaVaScRiPt:alert(1))'],
    ['data: link', '[x](data:text/html;base64,PHNjcmlwdD5hbGVydCgxKTwvc2NyaXB0Pg==)'],
    ['data: image', '![x](data:image/svg+xml;base64,PHN2ZyBvbmxvYWQ9YWxlcnQoMSk+)'],
    ['iframe', '<iframe src="javascript:alert(1)"></iframe>'],
    ['svg with onload', '<svg onload=alert(1)>'],
    ['style attribute', '<p style="background:url(javascript:alert(1))">x</p>'],
    ['form', '<form action="http://example.com"><input type=submit></form>'],
    ['autolink with javascript:', '<javascript:alert(1)>'],
  ]
  for (const [name, source] of vectors) {
    it(`neutralises ${name}`, () => {
      const html = htmlOf(source)
      const elements = elementsOf(html)
      expect(elements.map(e => e.tag).filter(t => ['script', 'iframe', 'svg', 'form', 'input', 'object', 'embed', 'style'].includes(t))).toEqual([])
      for (const e of elements) {
        for (const a of e.attrs) {
          expect(a.name.startsWith('on'), `${e.tag} ${a.name}`).toBe(false)
          expect(a.name).not.toBe('style')
          if (a.name === 'href' || a.name === 'src') expect(a.value).toMatch(/^(https?:|mailto:|#|\/|\.|[^:]*$)/i)
          // Text may still read «javascript:…»; no attribute may carry it.
          expect(a.value.toLowerCase()).not.toMatch(/javascript:|data:/)
        }
      }
    })
  }

  it('keeps safe links: http, https, mailto, relative and in-page', () => {
    const html = htmlOf('[a](https://example.org/x) [b](mailto:group@example.org) [c](../data) [d](#results)\n\n## Results')
    const hrefs = elementsOf(html).filter(e => e.tag === 'a').map(e => e.attrs.find(a => a.name === 'href')?.value)
    expect(hrefs).toEqual(['https://example.org/x', 'mailto:group@example.org', '../data', '#pg-results'])
    expect(html).toContain('<h2 id="pg-results">Results</h2>')
  })
})

describe('directives', () => {
  it('turns @figure and @table lines into blocks between HTML blocks', () => {
    const { blocks, problems } = renderPage('Intro.\n\n@figure 2\n\nMiddle.\n\n@table 7 columns=N,H rows=10\n\n@table 3\n\nEnd.')
    expect(problems).toEqual([])
    expect(blocks).toEqual([
      { kind: 'html', html: '<p>Intro.</p>' },
      { kind: 'figure', number: 2 },
      { kind: 'html', html: '<p>Middle.</p>' },
      { kind: 'table', computationId: 7, columns: ['N', 'H'], rows: 10 },
      { kind: 'table', computationId: 3 },
      { kind: 'html', html: '<p>End.</p>' },
    ])
    expect(pageReferences(blocks)).toEqual({ figures: [2], computations: [7, 3] })
  })

  it('reports bad directives with their line numbers and keeps them as text', () => {
    const source = ['# Title', '', '@figur 2', '', 'Text.', '', '@figure x', '', '@table 4 rows=0', '', '@table 4 colour=red', '', '@figure 1 2'].join('\n')
    const { blocks, problems } = renderPage(source)
    expect(problems.map(p => p.line)).toEqual([3, 7, 9, 11, 13])
    expect(problems[0]!.message).toContain('@figur 2')
    expect(blocks.filter(b => b.kind !== 'html')).toEqual([])
    expect(htmlOf(source)).toContain('<p>@figur 2</p>')
  })

  it('leaves a directive-like word inside a sentence alone', () => {
    const { blocks, problems } = renderPage('See the plot below.\n@figure 2')
    expect(problems).toEqual([])
    expect(blocks).toEqual([{ kind: 'html', html: '<p>See the plot below.\n@figure 2</p>' }])
  })
})

describe('Markdown', () => {
  it('renders GFM tables', () => {
    const html = htmlOf('| N | β |\n| ---: | --- |\n| 100 | 2 |')
    const tags = elementsOf(html).map(e => e.tag)
    expect(tags).toEqual(['table', 'thead', 'tr', 'th', 'th', 'tbody', 'tr', 'td', 'td'])
    expect(html).toContain('<td align="right">100</td>')
  })

  it('gives headings distinct ids for anchors', () => {
    const html = htmlOf('# Next-order energy\n\n## Next-order energy\n\n### Ψ₆ order')
    expect(elementsOf(html).map(e => e.attrs.find(a => a.name === 'id')?.value)).toEqual(['pg-next-order-energy', 'pg-next-order-energy-1', 'pg-ψ6-order'])
  })
})
