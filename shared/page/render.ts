// The companion page: Markdown with math and directives of our own, rendered to safe HTML blocks.
// Pipeline: remark-parse + remark-gfm + remark-math → our directive pass → remark-rehype (raw HTML
// dropped) → rehype-sanitize (strict schema) → heading anchors → rehype-katex (after sanitising,
// so KaTeX's own markup is kept) → rehype-stringify. Pure TypeScript: no Node or browser APIs.
//
// Directives (a paragraph of one line):
//   @figure 2                          figure 2 of the companion, live
//   @table 7 columns=N,H rows=10       the result table of computation 7
import type { Element, ElementContent, Root as HastRoot, RootContent as HastContent } from 'hast'
import type { Paragraph, Root as MdastRoot, RootContent } from 'mdast'
import katex from 'katex'
import type { KatexOptions } from 'katex'
import { unified } from 'unified'
import remarkParse from 'remark-parse'
import remarkGfm from 'remark-gfm'
import remarkMath from 'remark-math'
import remarkRehype from 'remark-rehype'
import rehypeSanitize, { defaultSchema } from 'rehype-sanitize'
import type { Options as SanitizeSchema } from 'rehype-sanitize'
import rehypeKatex from 'rehype-katex'
import rehypeStringify from 'rehype-stringify'

export type PageBlock
  = | { kind: 'html', html: string }
    | { kind: 'figure', number: number }
    | { kind: 'table', computationId: number, columns?: string[], rows?: number }

export interface PageProblem {
  line: number
  message: string
}

export interface RenderedPage {
  blocks: PageBlock[]
  problems: PageProblem[]
}

/** The longest page text accepted, in characters. */
export const PAGE_TEXT_LIMIT = 200_000
/** The most rows a @table directive may ask for. */
export const TABLE_ROW_LIMIT = 500
/** Prefix of every id in the rendered page (and of the in-page links that point at them). */
export const PAGE_ID_PREFIX = 'pg-'

/**
 * KaTeX settings: no \href, \url, \includegraphics or \html… commands (trust: false), a bounded
 * macro expansion and sizes, and errors shown in place instead of thrown.
 */
export const PAGE_KATEX_OPTIONS: KatexOptions = {
  throwOnError: false,
  trust: false,
  maxExpand: 500,
  maxSize: 30,
  strict: 'ignore',
  errorColor: '#a3342f',
}

const BLOCK_TAG = 'qf-page-block'

// A strict schema derived from the sanitiser's default: no script, style, iframe, object, embed,
// form or event-handler attributes (none of them is in the default list), no style attributes,
// links only over http, https or mailto (relative links and #fragments stay), images over http(s).
const schema: SanitizeSchema = {
  ...defaultSchema,
  clobberPrefix: PAGE_ID_PREFIX,
  tagNames: [...(defaultSchema.tagNames ?? []).filter(t => !['input'].includes(t)), BLOCK_TAG],
  attributes: {
    ...defaultSchema.attributes,
    code: [['className', /^language-./, 'math-inline', 'math-display']],
    li: [],
    ul: [],
    ol: [['start']],
    [BLOCK_TAG]: ['dataIndex'],
  },
  protocols: {
    href: ['http', 'https', 'mailto'],
    cite: ['http', 'https'],
    src: ['http', 'https'],
    longDesc: ['http', 'https'],
  },
  strip: ['script', 'style', 'iframe', 'object', 'embed', 'form', 'textarea', 'select', 'button', 'svg', 'math'],
}

type Directive
  = | { ok: true, block: Exclude<PageBlock, { kind: 'html' }> }
    | { ok: false, message: string }

const DIRECTIVE_HELP = 'write «@figure <number>» or «@table <computation> [columns=A,B] [rows=N]»'

/** Reads one directive line (it starts with @); a message when it is not one we know. */
export function parseDirective(line: string): Directive {
  const words = line.trim().split(/\s+/)
  const name = words[0]!.slice(1)
  const whole = (w: string | undefined) => (w !== undefined && /^[1-9]\d{0,8}$/.test(w) ? Number(w) : null)
  if (name === 'figure') {
    const number = whole(words[1])
    if (number === null) return { ok: false, message: `«${line.trim()}»: @figure needs a figure number (a whole number from 1), e.g. «@figure 2».` }
    if (words.length > 2) return { ok: false, message: `«${line.trim()}»: @figure takes only the figure number.` }
    return { ok: true, block: { kind: 'figure', number } }
  }
  if (name === 'table') {
    const computationId = whole(words[1])
    if (computationId === null) return { ok: false, message: `«${line.trim()}»: @table needs a computation number (a whole number from 1), e.g. «@table 7».` }
    const block: Extract<PageBlock, { kind: 'table' }> = { kind: 'table', computationId }
    for (const option of words.slice(2)) {
      const [key, value, ...rest] = option.split('=')
      if (key === 'columns' && value && !rest.length && !block.columns) {
        const columns = value.split(',').map(c => c.trim())
        if (columns.some(c => !/^[\w.:-]{1,60}$/.test(c))) return { ok: false, message: `«${line.trim()}»: columns are names separated by commas, e.g. «columns=N,H».` }
        block.columns = columns
      }
      else if (key === 'rows' && value !== undefined && !rest.length && block.rows === undefined) {
        const rows = whole(value)
        if (rows === null || rows > TABLE_ROW_LIMIT) return { ok: false, message: `«${line.trim()}»: rows is a whole number from 1 to ${TABLE_ROW_LIMIT}.` }
        block.rows = rows
      }
      else {
        return { ok: false, message: `«${line.trim()}»: unknown or repeated option «${option}»; @table takes columns=… and rows=….` }
      }
    }
    return { ok: true, block }
  }
  return { ok: false, message: `Unknown directive «${line.trim()}»: ${DIRECTIVE_HELP}.` }
}

export interface PageDirective {
  block: Exclude<PageBlock, { kind: 'html' }>
  line: number
}

interface RenderState {
  directives: PageDirective[]
  problems: PageProblem[]
}

// Top-level paragraphs of one line that start with @ are directives; known ones become block
// markers, others stay as text and are reported.
function directivePass(source: string, state: RenderState) {
  return (tree: MdastRoot) => {
    tree.children = tree.children.map((node): RootContent => {
      if (node.type !== 'paragraph' || !node.position) return node
      const start = node.position.start.offset ?? 0
      const end = node.position.end.offset ?? 0
      const text = source.slice(start, end).trim()
      if (!text.startsWith('@') || text.includes('\n') || !/^@[A-Za-z]/.test(text)) return node
      const parsed = parseDirective(text)
      if (!parsed.ok) {
        state.problems.push({ line: node.position.start.line, message: parsed.message })
        return node
      }
      state.directives.push({ block: parsed.block, line: node.position.start.line })
      const marker: Paragraph = {
        type: 'paragraph',
        children: [],
        data: { hName: BLOCK_TAG, hProperties: { dataIndex: String(state.directives.length - 1) } },
      }
      return marker
    })
  }
}

// Math that KaTeX cannot read is shown in place (an error span); here it is also reported by line.
function mathCheckPass(state: RenderState) {
  return (tree: MdastRoot) => {
    const visit = (node: { type: string, value?: string, lang?: string | null, children?: unknown[], position?: { start: { line: number } } }) => {
      const fenced = node.type === 'code' && node.lang === 'math'
      if ((node.type === 'math' || node.type === 'inlineMath' || fenced) && typeof node.value === 'string') {
        try {
          katex.renderToString(node.value, { ...PAGE_KATEX_OPTIONS, displayMode: node.type !== 'inlineMath', throwOnError: true })
        }
        catch (error) {
          const message = error instanceof Error ? error.message.replace(/^KaTeX parse error: /, '') : String(error)
          state.problems.push({ line: node.position?.start.line ?? 1, message: `Math could not be set: ${message}` })
        }
      }
      for (const child of node.children ?? []) visit(child as typeof node)
    }
    visit(tree)
  }
}

function textOf(node: HastContent | HastRoot): string {
  if (node.type === 'text') return node.value
  if ('children' in node) return (node.children as HastContent[]).map(textOf).join('')
  return ''
}

/** An anchor name for a heading: lower case letters, digits and hyphens. */
export function headingSlug(text: string): string {
  return text.toLowerCase().normalize('NFKD').replace(/[\u0300-\u036F]/g, '')
    .replace(/[^\p{L}\p{N}\s-]/gu, '').trim().replace(/\s+/g, '-').slice(0, 80) || 'section'
}

// After sanitising: headings get ids (prefixed, like every id left by the sanitiser), and in-page
// links (#name) get the same prefix so they still find their target.
function anchorPass() {
  return (tree: HastRoot) => {
    const used = new Map<string, number>()
    const visit = (node: HastRoot | Element) => {
      for (const child of node.children) {
        if (child.type !== 'element') continue
        if (/^h[1-6]$/.test(child.tagName) && child.properties.id === undefined) {
          const base = headingSlug(textOf(child))
          const seen = used.get(base) ?? 0
          used.set(base, seen + 1)
          child.properties.id = `${PAGE_ID_PREFIX}${seen ? `${base}-${seen}` : base}`
        }
        const href = child.properties.href
        if (child.tagName === 'a' && typeof href === 'string' && href.startsWith('#') && !href.startsWith(`#${PAGE_ID_PREFIX}`)) {
          child.properties.href = `#${PAGE_ID_PREFIX}${href.slice(1)}`
        }
        visit(child)
      }
    }
    visit(tree)
  }
}

/** Renders page text to blocks of sanitised HTML, figures and tables, with the problems found. */
export function renderPage(source: string): RenderedPage {
  const { blocks, problems } = renderPageWithDirectives(source)
  return { blocks, problems }
}

/** renderPage, with the directives found and the line of each. */
export function renderPageWithDirectives(source: string): RenderedPage & { directives: PageDirective[] } {
  const text = source.replace(/\r\n?/g, '\n')
  const state: RenderState = { directives: [], problems: [] }
  const processor = unified()
    .use(remarkParse)
    .use(remarkGfm)
    .use(remarkMath)
    .use(() => directivePass(text, state))
    .use(() => mathCheckPass(state))
    .use(remarkRehype, { allowDangerousHtml: false, clobberPrefix: '' })
    .use(rehypeSanitize, schema)
    .use(anchorPass)
    .use(rehypeKatex, PAGE_KATEX_OPTIONS)
    .use(rehypeStringify)
  const tree = processor.runSync(processor.parse(text)) as HastRoot

  const blocks: PageBlock[] = []
  let group: HastContent[] = []
  const flush = () => {
    if (group.some(node => node.type !== 'text' || node.value.trim() !== '')) {
      blocks.push({ kind: 'html', html: processor.stringify({ type: 'root', children: group }).trim() })
    }
    group = []
  }
  for (const node of tree.children) {
    if (node.type === 'element' && node.tagName === BLOCK_TAG) {
      flush()
      const directive = state.directives[Number(node.properties.dataIndex)]
      if (directive) blocks.push(directive.block)
    }
    else {
      group.push(node as ElementContent)
    }
  }
  flush()
  state.problems.sort((a, b) => a.line - b.line)
  return { blocks, problems: state.problems, directives: state.directives }
}

/** The figure numbers and computation ids a page refers to, each once, in order of appearance. */
export function pageReferences(blocks: PageBlock[]): { figures: number[], computations: number[] } {
  const figures = new Set<number>()
  const computations = new Set<number>()
  for (const b of blocks) {
    if (b.kind === 'figure') figures.add(b.number)
    if (b.kind === 'table') computations.add(b.computationId)
  }
  return { figures: [...figures], computations: [...computations] }
}
