// Computations and their jobs. A computation's row is its job: queued rows are claimed by the
// runner (server/plugins/computations.ts), run in a worker thread, and end current, failed or
// cancelled. Results are stored by input hash, so identical inputs are computed once.
import { createHash } from 'node:crypto'
import { MessageChannel } from 'node:worker_threads'
import type { User } from 'lucia'
import { ENGINE_VERSION } from '#shared/physics/version'
import type { CompanionRow } from '#shared/types/db'
import { checkParameters, findQuantity } from '../../cli/catalogue'
import type { ComputeInput, ComputeResult } from '../workers/compute'
import { commitChange } from './manifest'

const MAX_ATTEMPTS = 3

type EnsembleRow = typeof tables.ensembles.$inferSelect

function canonical(value: unknown): unknown {
  if (Array.isArray(value)) return value.map(canonical)
  if (value && typeof value === 'object') return Object.fromEntries(Object.keys(value).sort().map(k => [k, canonical((value as Record<string, unknown>)[k])]))
  return value
}

/** The hash of everything a result depends on: quantity, parameters, each ensemble's bytes and setting, engine version. */
export function inputHashFor(quantity: string, parameters: Record<string, unknown>, ensembles: Array<Pick<EnsembleRow, 'sha256' | 'setting'>>): string {
  const text = JSON.stringify(canonical({
    quantity,
    parameters,
    ensembles: ensembles.map(e => ({ sha256: e.sha256, setting: e.setting })),
    engineVersion: ENGINE_VERSION,
  }))
  return createHash('sha256').update(text).digest('hex')
}

async function ensemblesOf(companionId: number, ids: number[]): Promise<EnsembleRow[]> {
  if (ids.length === 0) return []
  const rows = await useDB().select().from(tables.ensembles).where(and(eq(tables.ensembles.companionId, companionId), inArray(tables.ensembles.id, ids)))
  return ids.map(id => rows.find(r => r.id === id)).filter((r): r is EnsembleRow => r !== undefined)
}

export async function resultFor(hash: string) {
  const [row] = await useDB().select({ id: tables.computationResults.id }).from(tables.computationResults).where(eq(tables.computationResults.inputHash, hash)).limit(1)
  return row?.id
}

export async function createComputation(companion: CompanionRow, user: User, input: { name: string, quantity: string, ensembleIds: number[], parameters: Record<string, unknown> }) {
  const spec = findQuantity(input.quantity)
  if (!spec) throw createError({ statusCode: 422, statusMessage: `There is no quantity ${input.quantity}.`, data: { fields: { quantity: 'Choose a quantity from the catalogue.' } } })
  const checked = checkParameters(spec, input.parameters)
  if (!checked.ok) throw createError({ statusCode: 422, statusMessage: 'Some parameters are not valid.', data: { fields: checked.problems } })
  const ensembles = await ensemblesOf(companion.id, input.ensembleIds)
  if (ensembles.length !== input.ensembleIds.length) {
    throw createError({ statusCode: 422, statusMessage: 'Some of those ensembles are not in this companion.', data: { fields: { ensembleIds: 'Choose ensembles of this companion.' } } })
  }
  const inputHash = inputHashFor(spec.id, checked.values, ensembles)
  const resultId = await resultFor(inputHash)
  const { result: id } = await commitChange(companion, user, async (tx) => {
    const [row] = await tx.insert(tables.computations).values({
      companionId: companion.id,
      name: input.name,
      quantity: spec.id,
      parameters: checked.values as Record<string, string | number | boolean>,
      ensembleIds: input.ensembleIds,
      status: resultId ? 'current' : 'queued',
      inputHash,
      resultId: resultId ?? null,
      progress: resultId ? 1 : 0,
      progressNote: resultId ? 'the same inputs were computed before; that result is reused' : '',
      createdBy: user.id,
    }).$returningId()
    return { result: row!.id, message: `Add computation ${row!.id} «${input.name}»: ${spec.id} over ensemble${input.ensembleIds.length === 1 ? '' : 's'} ${input.ensembleIds.join(', ')}` }
  })
  return { id, status: resultId ? 'current' : 'queued', reused: Boolean(resultId) }
}

export async function listComputations(companionId: number) {
  const c = tables.computations
  return useDB().select({
    id: c.id, name: c.name, quantity: c.quantity, parameters: c.parameters, ensembleIds: c.ensembleIds, status: c.status,
    progress: c.progress, progressNote: c.progressNote, error: c.error, attempts: c.attempts, startedAt: c.startedAt,
    finishedAt: c.finishedAt, resultId: c.resultId, inputHash: c.inputHash, createdAt: c.createdAt,
  }).from(c).where(eq(c.companionId, companionId)).orderBy(desc(c.id)).limit(500)
}

export async function findComputation(companionId: number, id: number) {
  const [row] = await useDB().select().from(tables.computations).where(and(eq(tables.computations.companionId, companionId), eq(tables.computations.id, id))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'No computation by that number in this companion.' })
  return row
}

export async function computationResult(resultId: number | null) {
  if (!resultId) return null
  const [row] = await useDB().select().from(tables.computationResults).where(eq(tables.computationResults.id, resultId)).limit(1)
  return row ?? null
}

export async function cancelComputation(companionId: number, id: number) {
  const row = await findComputation(companionId, id)
  if (row.status !== 'queued' && row.status !== 'running') throw createError({ statusCode: 409, statusMessage: `This computation is ${row.status}; only queued or running ones can be cancelled.` })
  await useDB().update(tables.computations).set({ status: 'cancelled', finishedAt: new Date(), progressNote: 'cancelled' }).where(eq(tables.computations.id, id))
}

export async function requeueComputation(companionId: number, id: number) {
  const row = await findComputation(companionId, id)
  if (row.status === 'queued' || row.status === 'running') throw createError({ statusCode: 409, statusMessage: 'This computation is already waiting or running.' })
  const ensembles = await ensemblesOf(companionId, row.ensembleIds)
  const inputHash = inputHashFor(row.quantity, row.parameters, ensembles)
  await useDB().update(tables.computations).set({ status: 'queued', inputHash, attempts: 0, error: null, progress: 0, progressNote: '' }).where(eq(tables.computations.id, id))
}

/** After an ensemble, a convention or the engine changed: queues the computations whose inputs changed. */
export async function requeueAffected(companionId?: number): Promise<number> {
  const c = tables.computations
  const rows = await useDB().select().from(c).where(and(companionId ? eq(c.companionId, companionId) : undefined, inArray(c.status, ['current', 'failed'])))
  let queued = 0
  for (const row of rows) {
    const ensembles = await ensemblesOf(row.companionId, row.ensembleIds)
    if (ensembles.length !== row.ensembleIds.length) {
      await useDB().update(c).set({ status: 'failed', error: 'An ensemble of this computation was removed; restore it or make a new computation.', finishedAt: new Date() }).where(eq(c.id, row.id))
      continue
    }
    const inputHash = inputHashFor(row.quantity, row.parameters, ensembles)
    if (inputHash === row.inputHash) continue
    const resultId = await resultFor(inputHash)
    await useDB().update(c).set(resultId
      ? { inputHash, resultId, status: 'current', progress: 1, progressNote: 'recomputed earlier with the same inputs' }
      : { inputHash, status: 'queued', attempts: 0, error: null, progress: 0, progressNote: 'inputs changed' }).where(eq(c.id, row.id))
    queued++
  }
  return queued
}

/** How long a running row may go without a heartbeat before it counts as interrupted. */
const STALE_SECONDS = 15

/** Rows left running by a server or worker that stopped (no heartbeat for a while): back in the
 *  queue, unless they used up their attempts. */
export async function recoverInterrupted(): Promise<void> {
  const c = tables.computations
  const stale = and(eq(c.status, 'running'), sql`${c.heartbeatAt} < UTC_TIMESTAMP() - INTERVAL ${STALE_SECONDS} SECOND`)
  await useDB().update(c).set({ status: 'failed', error: `Gave up after ${MAX_ATTEMPTS} attempts: the work stopped each time.`, finishedAt: new Date() })
    .where(and(stale, sql`${c.attempts} >= ${MAX_ATTEMPTS}`))
  await useDB().update(c).set({ status: 'queued', progressNote: 'resumed after an interruption' }).where(stale)
}

/** Claims and runs the oldest queued computation; false when there was none. */
export async function runNextComputation(): Promise<boolean> {
  const c = tables.computations
  const db = useDB()
  const [next] = await db.select().from(c).where(eq(c.status, 'queued')).orderBy(asc(c.id)).limit(1)
  if (!next) return false
  const [claim] = await db.update(c).set({ status: 'running', attempts: sql`${c.attempts} + 1`, startedAt: new Date(), heartbeatAt: new Date(), progress: 0, error: null })
    .where(and(eq(c.id, next.id), eq(c.status, 'queued')))
  if (claim.affectedRows !== 1) return true
  const cached = await resultFor(next.inputHash)
  if (cached) {
    await db.update(c).set({ status: 'current', resultId: cached, progress: 1, finishedAt: new Date(), progressNote: 'the same inputs were computed before; that result is reused' }).where(eq(c.id, next.id))
    return true
  }
  const ensembles = await ensemblesOf(next.companionId, next.ensembleIds)
  const abort = new AbortController()
  const channel = new MessageChannel()
  let latest = { done: 0, total: 1, note: '' }
  channel.port2.on('message', (message: typeof latest) => {
    latest = message
  })
  const beat = setInterval(async () => {
    const [row] = await db.select({ status: c.status }).from(c).where(eq(c.id, next.id)).limit(1)
    if (row?.status === 'cancelled') abort.abort()
    else await db.update(c).set({ heartbeatAt: new Date(), progress: latest.total ? latest.done / latest.total : 0, progressNote: latest.note.slice(0, 200) }).where(and(eq(c.id, next.id), eq(c.status, 'running')))
  }, 500)
  try {
    const files = await Promise.all(ensembles.map(async e => ({ id: e.id, name: e.name, fileName: e.fileName, bytes: await getObjectBytes(e.objectKey), setting: e.setting })))
    const task: ComputeInput = { quantity: next.quantity, parameters: next.parameters, ensembles: files, inputHash: next.inputHash, port: channel.port1 }
    const result = await useWorkerPool('compute').run(task, { transferList: [channel.port1], signal: abort.signal }) as ComputeResult
    if (!result.ok) {
      await db.update(c).set({ status: 'failed', error: result.reason, finishedAt: new Date() }).where(and(eq(c.id, next.id), eq(c.status, 'running')))
      return true
    }
    await db.insert(tables.computationResults).values({ inputHash: next.inputHash, quantity: next.quantity, engineVersion: ENGINE_VERSION, table: result.table })
      .onDuplicateKeyUpdate({ set: { quantity: next.quantity } })
    const resultId = await resultFor(next.inputHash)
    await db.update(c).set({ status: 'current', resultId, progress: 1, progressNote: 'done', finishedAt: new Date() }).where(and(eq(c.id, next.id), eq(c.status, 'running')))
  }
  catch (error) {
    if (abort.signal.aborted) return true
    const reason = error instanceof Error ? error.message : String(error)
    const [row] = await db.select({ attempts: c.attempts }).from(c).where(eq(c.id, next.id)).limit(1)
    const retry = (row?.attempts ?? MAX_ATTEMPTS) < MAX_ATTEMPTS
    await db.update(c).set(retry
      ? { status: 'queued', progressNote: `retrying after: ${reason}`.slice(0, 200) }
      : { status: 'failed', error: `Failed ${MAX_ATTEMPTS} times; last: ${reason}`, finishedAt: new Date() }).where(eq(c.id, next.id))
  }
  finally {
    clearInterval(beat)
    channel.port2.close()
  }
  return true
}
