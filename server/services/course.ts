// Moving a companion along its course (draft → in review → revising → accepted → published,
// or withdrawn), with a reason and an audit entry for each move, and a message to its members.
import type { H3Event } from 'h3'
import { companionStateLabel } from '#shared/types/roles'
import { findMove, movesFor } from '#shared/review/course'
import type { MoveInput } from '#shared/utils/review-validation'
import type { CompanionState } from '#shared/types/roles'
import type { CompanionAccess } from '../utils/guards'
import type { ShownPerson } from './identity'
import { nameFor, peopleOf, personFor } from './identity'
import { recordEvent } from './audit'
import { repositoryDirectory } from './manifest'

export async function moveCompanion(event: H3Event, access: CompanionAccess, input: MoveInput) {
  const { companion, role } = access
  const move = findMove(companion.state, input.to)
  if (!move) {
    const possible = movesFor(companion.state, 'editor').map(m => companionStateLabel[m.to])
    throw createError({
      statusCode: 409,
      statusMessage: `A ${companionStateLabel[companion.state]} companion cannot become ${companionStateLabel[input.to]}; from here it may become ${possible.join(' or ') || 'nothing else'}.`,
      data: { fields: { to: 'Not a move the course allows from the present state.' } },
    })
  }
  if (!movesFor(companion.state, role).includes(move)) {
    throw createError({ statusCode: 403, statusMessage: `Only the editor may ${move.action.toLowerCase()}.` })
  }
  const head = await headOid(repositoryDirectory(companion.id)).catch(() => null)
  const db = useDB()
  const c = tables.companions
  const changed = await db.transaction(async (tx) => {
    const publishing = input.to === 'published'
    const [result] = await tx.update(c).set({
      state: input.to,
      ...(publishing ? { publishedAt: new Date(), publishedRevision: head, remarksPublic: Boolean(input.publishRemarks) } : {}),
    }).where(and(eq(c.id, companion.id), eq(c.state, companion.state)))
    if (!result.affectedRows) return false
    await recordEvent({
      companionId: companion.id,
      actorId: access.user?.id ?? null,
      kind: 'state',
      fromState: companion.state,
      toState: input.to,
      reason: input.reason,
      revision: head,
      detail: publishing ? { remarksPublic: Boolean(input.publishRemarks) } : {},
    }, tx)
    return true
  })
  if (!changed) throw createError({ statusCode: 409, statusMessage: 'Someone else moved this companion a moment ago; reload to see its state.' })
  const notified = await tellMembers(event, access, move.action, input)
  return { state: input.to, revision: head, ...notified }
}

/** Tells every other member of the move, its reason and where to look. */
async function tellMembers(event: H3Event, access: CompanionAccess, action: string, input: MoveInput) {
  const { companion } = access
  const m = tables.memberships
  const u = tables.users
  const members = await useDB().select({ id: u.id, email: u.email, displayName: u.displayName })
    .from(m).innerJoin(u, eq(u.id, m.userId)).where(eq(m.companionId, companion.id))
  const base = siteUrl(event)
  const who = access.user?.displayName ?? 'An administrator'
  let failed = 0
  for (const member of members) {
    if (member.id === access.user?.id) continue
    const sent = await trySendMail(composeMail(member.email, `${companion.title}: now ${companionStateLabel[input.to]}`, [
      `Dear ${member.displayName},`,
      `${who} moved the companion "${companion.title}" from ${companionStateLabel[companion.state]} to ${companionStateLabel[input.to]} (${action.toLowerCase()}).`,
      `Reason given: ${input.reason}`,
      { link: `${base}/c/${companion.slug}/course`, label: 'See the companion\'s course' },
    ]))
    if (!sent.mailed) failed++
  }
  return { mailed: failed === 0, mailFailures: failed }
}

/** Anonymity of reviewers and publication of remarks: the editor's settings, each change audited. */
export async function changeReviewSettings(access: CompanionAccess, input: { identitiesOpen?: boolean, remarksPublic?: boolean, reason: string }) {
  const { companion } = access
  const set: { identitiesOpen?: boolean, remarksPublic?: boolean } = {}
  if (input.identitiesOpen !== undefined && input.identitiesOpen !== companion.identitiesOpen) set.identitiesOpen = input.identitiesOpen
  if (input.remarksPublic !== undefined && input.remarksPublic !== companion.remarksPublic) set.remarksPublic = input.remarksPublic
  await useDB().transaction(async (tx) => {
    if (Object.keys(set).length === 0) return
    await tx.update(tables.companions).set(set).where(eq(tables.companions.id, companion.id))
    if (set.identitiesOpen !== undefined) {
      await recordEvent({ companionId: companion.id, actorId: access.user?.id ?? null, kind: 'identities', reason: input.reason, detail: { open: set.identitiesOpen } }, tx)
    }
    if (set.remarksPublic !== undefined) {
      await recordEvent({ companionId: companion.id, actorId: access.user?.id ?? null, kind: 'remarks-public', reason: input.reason, detail: { public: set.remarksPublic } }, tx)
    }
  })
  return {
    identitiesOpen: set.identitiesOpen ?? companion.identitiesOpen,
    remarksPublic: set.remarksPublic ?? companion.remarksPublic,
    changed: Object.keys(set),
  }
}

export interface EventView {
  id: number
  kind: string
  actor: ShownPerson
  fromState: CompanionState | null
  toState: CompanionState | null
  reason: string
  detail: Record<string, string | number | boolean | null>
  revision: string | null
  at: Date
}

/** The audit trail as the caller may see it (newest first); names through the anonymity rule. */
export async function listEvents(access: CompanionAccess): Promise<EventView[]> {
  const e = tables.companionEvents
  const editor = access.role === 'editor'
  const rows = await useDB().select().from(e)
    .where(editor ? eq(e.companionId, access.companion.id) : and(eq(e.companionId, access.companion.id), eq(e.kind, 'state')))
    .orderBy(desc(e.createdAt), desc(e.id)).limit(1000)
  const people = await peopleOf(access.companion.id)
  const out: EventView[] = []
  for (const row of rows) {
    out.push({
      id: row.id,
      kind: row.kind,
      actor: nameFor(access, await personFor(people, row.actorId)),
      fromState: row.fromState,
      toState: row.toState,
      reason: row.reason,
      detail: row.detail,
      revision: row.revision,
      at: row.createdAt,
    })
  }
  return out
}
