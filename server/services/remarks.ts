// Remarks: threads pinned to a figure of one revision (the whole figure, a datum or a region).
// Members from reviewer up read and write them; readers (and the public) read them only when the
// companion is published with its remarks public. Every name shown goes through `nameFor`, from the
// caller's access, so authors see "Reviewer <n>" and never a reviewer's name, id or e-mail.
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { RemarkAnchor } from '../db/schema'
import type { CompanionAccess } from '../utils/guards'
import type { RemarkState } from '#shared/utils/remarks'
import { nameFor, peopleOf, personFor } from './identity'
import type { Person, ShownPerson } from './identity'
import { recordEvent } from './audit'
import { repositoryDirectory } from './manifest'
import { notifyRemark } from './notices'

/** Who may read the remarks of a companion (404 when they may not see it, 403 for readers while remarks are private). */
export async function requireRemarkReader(event: H3Event, slug: string): Promise<CompanionAccess> {
  if (event.context.token) return requireCompanionRole(event, slug, 'reviewer')
  const access = await findCompanionAccess(event, slug)
  if (!access) throw createError({ statusCode: 404, statusMessage: 'No companion by that name.' })
  if (roleAtLeast(access.role, 'reviewer')) return access
  if (access.companion.state === 'published' && access.companion.remarksPublic) return access
  if (!access.user) throw createError({ statusCode: 404, statusMessage: 'This companion shows no remarks.' })
  throw createError({ statusCode: 403, statusMessage: 'The remarks of this companion are seen by its reviewers, authors and editors.' })
}

/** Who may write remarks and replies: reviewers, authors and editors. */
export function requireRemarkWriter(event: H3Event, slug: string): Promise<CompanionAccess> {
  return requireCompanionRole(event, slug, 'reviewer')
}

export interface RemarkMessageView {
  id: number
  body: string
  createdAt: Date
  author: ShownPerson
}

export interface RemarkView {
  id: number
  figureNumber: number
  revision: string
  anchor: RemarkAnchor
  state: RemarkState
  createdAt: Date
  updatedAt: Date
  settledAt: Date | null
  author: ShownPerson
  settledBy: ShownPerson | null
  messages: RemarkMessageView[]
  /** May the caller settle or reopen it? */
  canSettle: boolean
  /** May the caller reply? */
  canReply: boolean
}

type RemarkRow = typeof tables.remarks.$inferSelect

/** The caller may settle or reopen: the remark's writer, authors and editors (site admins count as editors). */
export function maySettle(access: CompanionAccess, remark: Pick<RemarkRow, 'authorId'>): boolean {
  if (roleAtLeast(access.role, 'author')) return true
  return access.role === 'reviewer' && access.user !== null && remark.authorId === access.user.id
}

async function viewsOf(access: CompanionAccess, rows: RemarkRow[]): Promise<RemarkView[]> {
  if (!rows.length) return []
  const people = await peopleOf(access.companion.id)
  const messages = await useDB().select().from(tables.remarkMessages)
    .where(inArray(tables.remarkMessages.remarkId, rows.map(r => r.id)))
    .orderBy(asc(tables.remarkMessages.createdAt), asc(tables.remarkMessages.id))
  const cache = new Map<string, Person>()
  const shown = async (userId: string | null): Promise<ShownPerson> => {
    const key = userId ?? ''
    if (!cache.has(key)) cache.set(key, await personFor(people, userId))
    return nameFor(access, cache.get(key)!)
  }
  const canWrite = roleAtLeast(access.role, 'reviewer')
  const out: RemarkView[] = []
  for (const r of rows) {
    const thread: RemarkMessageView[] = []
    for (const m of messages.filter(m => m.remarkId === r.id)) {
      thread.push({ id: m.id, body: m.body, createdAt: m.createdAt, author: await shown(m.authorId) })
    }
    out.push({
      id: r.id,
      figureNumber: r.figureNumber,
      revision: r.revision,
      anchor: r.anchor,
      state: r.state,
      createdAt: r.createdAt,
      updatedAt: r.updatedAt,
      settledAt: r.settledAt,
      author: await shown(r.authorId),
      settledBy: r.settledBy ? await shown(r.settledBy) : null,
      messages: thread,
      canSettle: canWrite && maySettle(access, r),
      canReply: canWrite,
    })
  }
  return out
}

export async function listRemarks(access: CompanionAccess, filter: { figure?: number, state?: RemarkState }): Promise<RemarkView[]> {
  const r = tables.remarks
  const rows = await useDB().select().from(r).where(and(
    eq(r.companionId, access.companion.id),
    filter.figure === undefined ? undefined : eq(r.figureNumber, filter.figure),
    filter.state === undefined ? undefined : eq(r.state, filter.state),
  )).orderBy(asc(r.figureNumber), desc(r.createdAt), desc(r.id))
  return viewsOf(access, rows)
}

async function findRemarkRow(companionId: number, id: number): Promise<RemarkRow> {
  const [row] = await useDB().select().from(tables.remarks)
    .where(and(eq(tables.remarks.companionId, companionId), eq(tables.remarks.id, id))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'This companion has no remark by that number.' })
  return row
}

export async function findRemark(access: CompanionAccess, id: number): Promise<RemarkView> {
  const [view] = await viewsOf(access, [await findRemarkRow(access.companion.id, id)])
  return view!
}

/** The revision a new remark is made on: the companion repository's head. */
async function currentRevision(companionId: number): Promise<string> {
  try {
    return await headOid(repositoryDirectory(companionId))
  }
  catch (error) {
    if (error instanceof RevisionError && error.code === 'no-repository') {
      throw createError({ statusCode: 409, statusMessage: 'This companion has no revision yet to remark on.' })
    }
    throw error
  }
}

export async function createRemark(event: H3Event, access: CompanionAccess, input: { figureNumber: number, anchor: RemarkAnchor, body: string }): Promise<RemarkView> {
  const db = useDB()
  const [figure] = await db.select({ number: tables.figures.number }).from(tables.figures)
    .where(and(eq(tables.figures.companionId, access.companion.id), eq(tables.figures.number, input.figureNumber))).limit(1)
  if (!figure) {
    throw createError({ statusCode: 422, statusMessage: `This companion has no figure ${input.figureNumber}.`, data: { fields: { figureNumber: `There is no figure ${input.figureNumber} in this companion.` } } })
  }
  const revision = await currentRevision(access.companion.id)
  const userId = access.user!.id
  const id = await db.transaction(async (tx) => {
    const [made] = await tx.insert(tables.remarks).values({
      companionId: access.companion.id,
      figureNumber: input.figureNumber,
      revision,
      anchor: input.anchor,
      authorId: userId,
    }).$returningId()
    await tx.insert(tables.remarkMessages).values({ remarkId: made!.id, authorId: userId, body: input.body })
    await recordEvent({
      companionId: access.companion.id,
      actorId: userId,
      kind: 'remark',
      revision,
      detail: { action: 'opened', remark: made!.id, figure: input.figureNumber, anchor: input.anchor.kind },
    }, tx)
    return made!.id
  })
  const row = await findRemarkRow(access.companion.id, id)
  await notifyRemark(event, access, row, { body: input.body, opening: true })
  return findRemark(access, id)
}

export async function replyToRemark(event: H3Event, access: CompanionAccess, id: number, body: string): Promise<RemarkView> {
  const row = await findRemarkRow(access.companion.id, id)
  const userId = access.user!.id
  await useDB().transaction(async (tx) => {
    await tx.insert(tables.remarkMessages).values({ remarkId: row.id, authorId: userId, body })
    // Touch the thread so that its updatedAt says when it last moved.
    await tx.update(tables.remarks).set({ updatedAt: new Date() }).where(eq(tables.remarks.id, row.id))
    await recordEvent({ companionId: access.companion.id, actorId: userId, kind: 'remark', detail: { action: 'replied', remark: row.id, figure: row.figureNumber } }, tx)
  })
  await notifyRemark(event, access, row, { body, opening: false })
  return findRemark(access, id)
}

export async function setRemarkState(access: CompanionAccess, id: number, state: RemarkState): Promise<RemarkView> {
  const row = await findRemarkRow(access.companion.id, id)
  if (!maySettle(access, row)) {
    throw createError({ statusCode: 403, statusMessage: 'Only the remark\'s writer, the authors and the editors may settle or reopen it.' })
  }
  if (row.state !== state) {
    const userId = access.user!.id
    await useDB().transaction(async (tx) => {
      await tx.update(tables.remarks).set(state === 'settled'
        ? { state, settledBy: userId, settledAt: new Date() }
        : { state, settledBy: null, settledAt: null }).where(eq(tables.remarks.id, row.id))
      await recordEvent({ companionId: access.companion.id, actorId: userId, kind: 'remark', detail: { action: state === 'settled' ? 'settled' : 'reopened', remark: row.id, figure: row.figureNumber } }, tx)
    })
  }
  return findRemark(access, id)
}

export interface WaitingRemark {
  companion: { slug: string, title: string }
  remarkId: number
  figureNumber: number
  lastBy: ShownPerson
  excerpt: string
  at: Date
}

/**
 * Open remarks in the companions the account reviews, writes or edits whose last message is
 * someone else's: what waits for an answer (the desk lists them). Names as each companion shows them.
 */
export async function remarksWaitingFor(user: User): Promise<WaitingRemark[]> {
  const db = useDB()
  const m = tables.memberships
  const c = tables.companions
  const memberships = await db.select({ companion: c, role: m.role }).from(m).innerJoin(c, eq(c.id, m.companionId))
    .where(and(eq(m.userId, user.id), inArray(m.role, ['reviewer', 'author', 'editor'])))
  const out: WaitingRemark[] = []
  for (const { companion, role } of memberships) {
    const open = await db.select().from(tables.remarks)
      .where(and(eq(tables.remarks.companionId, companion.id), eq(tables.remarks.state, 'open')))
      .orderBy(desc(tables.remarks.updatedAt)).limit(50)
    if (!open.length) continue
    const access: CompanionAccess = { companion, role, membershipRole: role, user }
    const people = await peopleOf(companion.id)
    const messages = await db.select().from(tables.remarkMessages)
      .where(inArray(tables.remarkMessages.remarkId, open.map(r => r.id)))
      .orderBy(asc(tables.remarkMessages.createdAt), asc(tables.remarkMessages.id))
    for (const remark of open) {
      const last = messages.filter(x => x.remarkId === remark.id).at(-1)
      if (!last || last.authorId === user.id) continue
      // Reviewers answer threads they take part in; authors and editors answer every thread.
      if (role === 'reviewer' && remark.authorId !== user.id && !messages.some(x => x.remarkId === remark.id && x.authorId === user.id)) continue
      out.push({
        companion: { slug: companion.slug, title: companion.title },
        remarkId: remark.id,
        figureNumber: remark.figureNumber,
        lastBy: nameFor(access, await personFor(people, last.authorId)),
        excerpt: last.body.length > 160 ? `${last.body.slice(0, 157)}…` : last.body,
        at: last.createdAt,
      })
    }
  }
  return out.sort((a, b) => b.at.getTime() - a.at.getTime()).slice(0, 50)
}
