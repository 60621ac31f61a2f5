// Figures: a template of ours drawn from the results of computations, numbered within the companion.
// Its status follows its computations: current when all are current, queued while any waits or
// runs, failed when any failed.
import type { User } from 'lucia'
import type { TopLevelSpec } from 'vega-lite'
import { findFigureTemplate, figureTemplates } from '#shared/figures/templates'
import type { FigureStatus, ResultTable } from '#shared/figures/types'
import { EngineInputError } from '#shared/physics/errors'
import type { CompanionRow } from '#shared/types/db'
import { commitChange, repositoryDirectory, revisionProblem } from './manifest'
import { bindCustomSpec, checkCustomSpec } from './custom-figures'
import { inputHashFor, resultFor } from './computations'
import { overlay } from '#shared/figures/overlay'
import type { EnsembleSettingRecord } from '../db/schema'

const CUSTOM = { id: 'custom', title: 'Your own Vega-Lite spec (data named computation-<id>)', quantities: [] as string[], parameters: [] }

export function templateCatalogue() {
  return [...figureTemplates.map(t => ({ id: t.id, title: t.title, quantities: t.quantities, parameters: t.parameters })), CUSTOM]
}

export async function createFigure(companion: CompanionRow, user: User, input: { title: string, caption: string, template: string, computationIds: number[], options: Record<string, string | number | boolean>, spec?: Record<string, unknown> }) {
  const custom = input.template === 'custom'
  if (custom && !input.spec) throw createError({ statusCode: 422, statusMessage: 'A custom figure needs its Vega-Lite spec.', data: { fields: { spec: 'Give the spec.' } } })
  if (custom) checkCustomSpec(input.spec!, input.computationIds)
  const template = custom ? { id: 'custom', title: CUSTOM.title, quantities: [] as string[] } : findFigureTemplate(input.template)
  if (!template) throw createError({ statusCode: 422, statusMessage: `There is no figure template ${input.template}.`, data: { fields: { template: 'Choose a template.' } } })
  const c = tables.computations
  const found = await useDB().select({ id: c.id, quantity: c.quantity }).from(c).where(and(eq(c.companionId, companion.id), inArray(c.id, input.computationIds)))
  if (found.length !== input.computationIds.length) {
    throw createError({ statusCode: 422, statusMessage: 'Some of those computations are not in this companion.', data: { fields: { computationIds: 'Choose computations of this companion.' } } })
  }
  const wrong = custom ? [] : found.filter(f => !template.quantities.includes(f.quantity))
  if (wrong.length) {
    throw createError({ statusCode: 422, statusMessage: `The template «${template.title}» draws ${template.quantities.join(', ')}; computation ${wrong.map(w => `№ ${w.id} (${w.quantity})`).join(', ')} is not one of them.`, data: { fields: { computationIds: 'Choose computations of a quantity this template draws.' } } })
  }
  const { result: number } = await commitChange(companion, user, async (tx) => {
    const [last] = await tx.select({ n: sql<number>`COALESCE(MAX(${tables.figures.number}), 0)` }).from(tables.figures).where(eq(tables.figures.companionId, companion.id))
    const next = Number(last?.n ?? 0) + 1
    await tx.insert(tables.figures).values({ companionId: companion.id, number: next, title: input.title, caption: input.caption, template: template.id, computationIds: input.computationIds, options: input.options, customSpec: custom ? input.spec : null, createdBy: user.id })
    return { result: next, message: `Add figure ${next} «${input.title}» (${template.title})` }
  })
  return { number }
}

export async function listFigures(companionId: number) {
  const f = tables.figures
  return useDB().select().from(f).where(eq(f.companionId, companionId)).orderBy(asc(f.number))
}

export async function findFigure(companionId: number, number: number) {
  const [row] = await useDB().select().from(tables.figures).where(and(eq(tables.figures.companionId, companionId), eq(tables.figures.number, number))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: `This companion has no figure ${number}.` })
  return row
}

export interface DrawnFigure {
  status: FigureStatus
  tables: ResultTable[]
  spec: TopLevelSpec | null
  problem: string | null
}

/** The figure's tables from its computations' results, its status, and its Vega-Lite spec when all results are there. */
export async function drawFigure(figure: typeof tables.figures.$inferSelect): Promise<DrawnFigure> {
  const c = tables.computations
  const rows = await useDB().select().from(c).where(and(eq(c.companionId, figure.companionId), inArray(c.id, figure.computationIds)))
  const failed = rows.filter(r => r.status === 'failed' || r.status === 'cancelled')
  const waiting = rows.filter(r => r.status === 'queued' || r.status === 'running')
  const resultIds = rows.map(r => r.resultId).filter((id): id is number => id !== null)
  const results = resultIds.length ? await useDB().select().from(tables.computationResults).where(inArray(tables.computationResults.id, resultIds)) : []
  const drawn: ResultTable[] = figure.computationIds.flatMap((id) => {
    const row = rows.find(r => r.id === id)
    const result = results.find(r => r.id === row?.resultId)
    if (!row || !result) return []
    return [{
      computation: row.name,
      quantity: row.quantity,
      columns: result.table.columns,
      rows: result.table.rows,
      aggregates: Object.keys(result.table.aggregates).length ? [result.table.aggregates] : [],
      convention: result.table.convention,
      engineVersion: result.engineVersion,
      inputHash: result.inputHash,
    }]
  })
  const drifted = rows.flatMap((r) => {
    const result = results.find(x => x.id === r.resultId)
    if (!r.declared || !result) return []
    const comparison = compareDeclared(r.declared, result.table.rows)
    return comparison.verdict === 'differ' ? [`computation № ${r.id}: ${comparison.differing} of ${comparison.rows.length} declared values of ${comparison.column} differ from the recomputed ones (${comparison.tolerance})`] : []
  })
  const status: FigureStatus = failed.length
    ? { word: 'failed', detail: `computation ${failed.map(r => `№ ${r.id}`).join(', ')} ${failed[0]!.status}: ${failed[0]!.error ?? ''}`.trim() }
    : waiting.length || drawn.length < figure.computationIds.length
      ? { word: 'queued', detail: `waiting for computation ${waiting.map(r => `№ ${r.id}`).join(', ') || 'results'}` }
      : drifted.length
        ? { word: 'drifted', detail: drifted.join('; ') }
        : { word: 'current' }
  if (drawn.length < figure.computationIds.length) return { status, tables: drawn, spec: null, problem: null }
  try {
    const spec = figure.template === 'custom'
      ? bindCustomSpec(figure.customSpec ?? {}, drawn.map((t, k) => ({ ...t, id: figure.computationIds[k]! })))
      : findFigureTemplate(figure.template)!.build(drawn, { title: figure.title, ...figure.options })
    return { status, tables: drawn, spec, problem: null }
  }
  catch (error) {
    if (error instanceof EngineInputError) return { status: { word: 'failed', detail: error.message }, tables: drawn, spec: null, problem: error.message }
    throw error
  }
}

/** The figure as it was drawn at a revision — its computations on that revision's ensembles, whose
 *  results are found by their input hash — overlaid on the figure as it is now. */
export async function overlayWithRevision(figure: typeof tables.figures.$inferSelect, oid: string): Promise<TopLevelSpec> {
  const manifest = await readManifest(repositoryDirectory(figure.companionId), oid).catch(revisionProblem)
  const now = await drawFigure(figure)
  if (!now.spec) throw createError({ statusCode: 409, statusMessage: `Figure ${figure.number} cannot be drawn now: ${now.status.detail ?? now.status.word}.` })
  const c = tables.computations
  const rows = await useDB().select().from(c).where(and(eq(c.companionId, figure.companionId), inArray(c.id, figure.computationIds)))
  const then: ResultTable[] = []
  for (const id of figure.computationIds) {
    const row = rows.find(r => r.id === id)
    if (!row) throw createError({ statusCode: 404, statusMessage: `Computation ${id} of this figure no longer exists.` })
    const ensembles = row.ensembleIds.map((eid) => {
      const e = manifest.ensembles.find(x => x.id === eid)
      if (!e) throw createError({ statusCode: 409, statusMessage: `Revision ${oid.slice(0, 8)} has no ensemble ${eid}, which computation ${id} uses.` })
      return { sha256: e.sha256, setting: { geometry: e.geometry, kernel: e.kernel, potential: e.potential, beta: e.beta, convention: e.convention, labels: e.labels } as EnsembleSettingRecord }
    })
    const resultId = await resultFor(inputHashFor(row.quantity, row.parameters, ensembles))
    const [result] = resultId ? await useDB().select().from(tables.computationResults).where(eq(tables.computationResults.id, resultId)).limit(1) : []
    if (!result) throw createError({ statusCode: 409, statusMessage: `Computation ${id} was not computed on the data of revision ${oid.slice(0, 8)}, so there is nothing to overlay; queue it on that revision first.` })
    then.push({ computation: row.name, quantity: row.quantity, columns: result.table.columns, rows: result.table.rows, aggregates: [], convention: result.table.convention, engineVersion: result.engineVersion, inputHash: result.inputHash })
  }
  if (figure.template === 'custom') throw createError({ statusCode: 409, statusMessage: 'Revisions of a custom figure cannot be overlaid; draw them with one of the templates.' })
  const template = findFigureTemplate(figure.template)!
  const before = template.build(then, { title: figure.title, ...figure.options })
  return overlay(before, now.spec, [`revision ${oid.slice(0, 8)}`, 'now'])
}
