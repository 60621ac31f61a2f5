// The companion page: its text (companion.page_text and page.md in every revision), rendered to
// sanitised blocks, with the figures and computations it names checked against the companion.
import { createHash } from 'node:crypto'
import type { User } from 'lucia'
import type { CompanionRow } from '#shared/types/db'
import type { FigureStatus } from '#shared/figures/types'
import { pageReferences, renderPageWithDirectives } from '#shared/page/render'
import type { PageDirective, PageProblem, RenderedPage } from '#shared/page/render'
import { drawFigure, listFigures } from './figures'
import { commitChange, repositoryDirectory } from './manifest'
import { recordEvent } from './audit'

/** The file that holds the page text in every revision. */
export const PAGE_FILE = 'page.md'

export interface PageFigureRef { number: number, title: string, status: FigureStatus }
export interface PageComputationRef { id: number, name: string, quantity: string, status: string }

interface Known {
  figures: Array<{ number: number, title: string }>
  computations: Array<{ id: number, name: string, quantity: string, status: string }>
}

async function knownItems(companionId: number): Promise<Known> {
  const c = tables.computations
  const [figures, computations] = await Promise.all([
    listFigures(companionId),
    useDB().select({ id: c.id, name: c.name, quantity: c.quantity, status: c.status }).from(c).where(eq(c.companionId, companionId)).orderBy(asc(c.id)),
  ]).catch(error => rethrowUnavailable(error, 'The database'))
  return { figures: figures.map(f => ({ number: f.number, title: f.title })), computations }
}

/** Directives naming a figure or computation this companion does not have, one problem each. */
function missingReferences(directives: PageDirective[], known: Known): PageProblem[] {
  return directives.flatMap(({ block, line }) => {
    if (block.kind === 'figure' && !known.figures.some(f => f.number === block.number)) {
      return [{ line, message: `This companion has no figure ${block.number}.` }]
    }
    if (block.kind === 'table' && !known.computations.some(c => c.id === block.computationId)) {
      return [{ line, message: `This companion has no computation ${block.computationId}.` }]
    }
    return []
  })
}

/** The page rendered, with every problem (syntax, math, missing references) by line. */
export async function previewPage(companionId: number, text: string): Promise<RenderedPage> {
  const rendered = renderPageWithDirectives(text)
  const missing = missingReferences(rendered.directives, await knownItems(companionId))
  return { blocks: rendered.blocks, problems: [...rendered.problems, ...missing].sort((a, b) => a.line - b.line) }
}

/** What a reader of the page gets: text, blocks, problems, the named figures and computations, the revision. */
export async function pageView(companion: CompanionRow) {
  const text = companion.pageText
  const rendered = renderPageWithDirectives(text)
  const known = await knownItems(companion.id)
  const problems = [...rendered.problems, ...missingReferences(rendered.directives, known)].sort((a, b) => a.line - b.line)
  const refs = pageReferences(rendered.blocks)
  const figureRows = (await listFigures(companion.id)).filter(f => refs.figures.includes(f.number))
  const figures: PageFigureRef[] = []
  for (const f of figureRows) figures.push({ number: f.number, title: f.title, status: (await drawFigure(f)).status })
  const computations: PageComputationRef[] = known.computations.filter(c => refs.computations.includes(c.id))
  const revision = await headOid(repositoryDirectory(companion.id)).catch(() => null)
  return { text, textHash: textHash(text), blocks: rendered.blocks, problems, figures, computations, revision }
}

/** SHA-256 of a page text (hex), to tell whether it changed since someone loaded it. */
export function textHash(text: string): string {
  return createHash('sha256').update(text, 'utf8').digest('hex')
}

/**
 * Stores the page text and commits page.md with the manifest as one revision, with its audit
 * entry, in one transaction. A directive naming a missing figure or computation is a 422.
 */
export async function savePage(companion: CompanionRow, user: Pick<User, 'id' | 'displayName' | 'email'>, text: string, message?: string, basedOn?: string) {
  if (basedOn && basedOn !== textHash(companion.pageText) && text !== companion.pageText) {
    throw createError({
      statusCode: 409,
      statusMessage: 'Someone saved the page after you opened it. Copy your text, reload the page to see theirs, and combine the two.',
      data: { fields: { text: 'The page changed since you opened it.' }, current: { text: companion.pageText, textHash: textHash(companion.pageText) } },
    })
  }
  const rendered = renderPageWithDirectives(text)
  const missing = missingReferences(rendered.directives, await knownItems(companion.id))
  if (missing.length) {
    const all = missing.map(p => `Line ${p.line}: ${p.message}`).join(' ')
    throw createError({ statusCode: 422, statusMessage: 'The page names what this companion does not have.', message: all, data: { fields: { text: all }, problems: missing } })
  }
  const before = companion.pageText
  let changed = false
  const { revision } = await commitChange(companion, user, async (tx) => {
    await tx.update(tables.companions).set({ pageText: text }).where(eq(tables.companions.id, companion.id))
    return {
      result: null,
      message: message || (before ? 'Edit the page' : 'Write the page'),
      files: { [PAGE_FILE]: text },
      afterCommit: async (t, oid, committed) => {
        changed = committed
        if (committed) {
          await recordEvent({ companionId: companion.id, actorId: user.id, kind: 'page', revision: oid, detail: { characters: text.length } }, t)
        }
      },
    }
  })
  return { revision, changed, problems: rendered.problems, textHash: textHash(text) }
}
