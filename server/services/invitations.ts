// Invitations by e-mail to a role in a companion: a one-use link that expires, stored as a hash.
// Accepting needs an account with the invited address; following the link proves the address.
import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { CompanionRole } from '#shared/types/roles'
import { companionRoleLabel, companionStateLabel, roleAtLeast } from '#shared/types/roles'
import type { InvitationCreateInput } from '#shared/utils/review-validation'
import type { CompanionAccess } from '../utils/guards'
import { recordEvent } from './audit'
import { changeMemberRole, insertMembership } from './companions'

export const INVITATION_DAYS = 14

export type InvitationStatus = 'waiting' | 'accepted' | 'expired' | 'revoked'

export interface InvitationView {
  id: number
  email: string
  role: CompanionRole
  status: InvitationStatus
  sentAt: Date
  expiresAt: Date
  acceptedAt: Date | null
}

function statusOf(row: { acceptedAt: Date | null, revokedAt: Date | null, expiresAt: Date }, now = new Date()): InvitationStatus {
  if (row.acceptedAt) return 'accepted'
  if (row.revokedAt) return 'revoked'
  return row.expiresAt.getTime() <= now.getTime() ? 'expired' : 'waiting'
}

const roleWords: Record<CompanionRole, string> = {
  reader: 'read it before it is published',
  reviewer: 'review it: read the private companion, re-run its computations and leave remarks pinned to its figures',
  author: 'write it with the other authors: upload ensembles, attach computations and figures, write its page',
  editor: 'edit it: invite people, set roles and move it through review',
}

export async function createInvitation(event: H3Event, access: CompanionAccess, input: InvitationCreateInput) {
  const { companion } = access
  const db = useDB()
  const u = tables.users
  const m = tables.memberships
  const i = tables.invitations
  const [member] = await db.select({ role: m.role }).from(m).innerJoin(u, eq(u.id, m.userId))
    .where(and(eq(m.companionId, companion.id), eq(u.email, input.email))).limit(1)
  if (member) {
    throw createError({ statusCode: 409, statusMessage: `That address is already a member (${member.role}).`, data: { fields: { email: `Already a member as ${member.role}; change the role in the list instead.` } } })
  }
  const token = randomBytes(32).toString('base64url')
  const expiresAt = new Date(Date.now() + INVITATION_DAYS * 24 * 3600 * 1000)
  const id = await db.transaction(async (tx) => {
    // A new invitation to the same address replaces a waiting one (the old link stops working).
    await tx.update(i).set({ revokedAt: new Date() })
      .where(and(eq(i.companionId, companion.id), eq(i.email, input.email), isNull(i.acceptedAt), isNull(i.revokedAt)))
    const [made] = await tx.insert(i).values({
      companionId: companion.id, email: input.email, role: input.role, message: input.message,
      tokenHash: hashToken(token), invitedBy: access.user?.id ?? null, expiresAt,
    }).$returningId()
    await recordEvent({ companionId: companion.id, actorId: access.user?.id ?? null, kind: 'invitation', reason: '', detail: { email: input.email, role: input.role } }, tx)
    return made!.id
  })
  const link = `${siteUrl(event)}/invitations/${token}`
  const inviter = access.user?.displayName ?? 'The editor'
  const mail = await trySendMail(composeMail(input.email, `Invitation: ${companionRoleLabel[input.role].toLowerCase()} of "${companion.title}"`, [
    `${inviter} invites you to the Quillfield companion "${companion.title}"${companion.manuscriptRef ? ` (manuscript ${companion.manuscriptRef})` : ''} as ${companionRoleLabel[input.role].toLowerCase()}: to ${roleWords[input.role]}.`,
    ...(input.message ? [`Their note: ${input.message}`] : []),
    ...(input.role === 'reviewer' ? ['The authors will see you as a numbered reviewer, not by name, unless the editor decides otherwise.'] : []),
    { link, label: 'Open the invitation' },
    `The link works once and until ${expiresAt.toUTCString()}. You will need an account with this address (${input.email}); the invitation page lets you make one.`,
  ]))
  const [row] = await db.select().from(i).where(eq(i.id, id)).limit(1)
  return { invitation: view(row!), ...mail }
}

function view(row: typeof tables.invitations.$inferSelect): InvitationView {
  return { id: row.id, email: row.email, role: row.role, status: statusOf(row), sentAt: row.createdAt, expiresAt: row.expiresAt, acceptedAt: row.acceptedAt }
}

export async function listInvitations(companionId: number): Promise<InvitationView[]> {
  const i = tables.invitations
  const rows = await useDB().select().from(i).where(eq(i.companionId, companionId)).orderBy(desc(i.createdAt), desc(i.id)).limit(500)
  return rows.map(view)
}

export async function revokeInvitation(access: CompanionAccess, id: number): Promise<void> {
  const i = tables.invitations
  await useDB().transaction(async (tx) => {
    const [row] = await tx.select().from(i).where(and(eq(i.id, id), eq(i.companionId, access.companion.id))).limit(1)
    if (!row) throw createError({ statusCode: 404, statusMessage: 'No invitation with that number in this companion.' })
    if (statusOf(row) !== 'waiting') throw createError({ statusCode: 409, statusMessage: `That invitation is ${statusOf(row)}; only a waiting one can be withdrawn.` })
    await tx.update(i).set({ revokedAt: new Date() }).where(eq(i.id, id))
    await recordEvent({ companionId: access.companion.id, actorId: access.user?.id ?? null, kind: 'invitation-revoked', reason: '', detail: { email: row.email, role: row.role } }, tx)
  })
}

async function findByToken(token: string) {
  const i = tables.invitations
  const c = tables.companions
  const [row] = await useDB().select({ invitation: i, companion: { id: c.id, slug: c.slug, title: c.title, state: c.state, manuscriptRef: c.manuscriptRef } })
    .from(i).innerJoin(c, eq(c.id, i.companionId)).where(eq(i.tokenHash, hashToken(token))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'No invitation has that link. It may have been replaced by a newer one; ask the editor to send it again.' })
  return row
}

/** What the invitation page shows to whoever holds the link. */
export async function describeInvitation(token: string, user: User | null) {
  const { invitation, companion } = await findByToken(token)
  const [inviter] = invitation.invitedBy
    ? await useDB().select({ displayName: tables.users.displayName }).from(tables.users).where(eq(tables.users.id, invitation.invitedBy)).limit(1)
    : []
  return {
    companion: { slug: companion.slug, title: companion.title, manuscriptRef: companion.manuscriptRef, state: companionStateLabel[companion.state] },
    role: invitation.role,
    email: invitation.email,
    message: invitation.message,
    invitedBy: inviter?.displayName ?? 'The editor',
    status: statusOf(invitation),
    expiresAt: invitation.expiresAt,
    // Whether the signed-in account may accept (its address is the invited one).
    signedInAs: user?.email ?? null,
    matches: user ? user.email.toLowerCase() === invitation.email.toLowerCase() : false,
  }
}

export async function acceptInvitation(user: User, token: string) {
  const { invitation, companion } = await findByToken(token)
  return accept(user, invitation, companion)
}

/** From the desk: an invitation to the account's own address, once that address is verified. */
export async function acceptWaitingInvitation(user: User, id: number) {
  const i = tables.invitations
  const c = tables.companions
  const [row] = await useDB().select({ invitation: i, companion: { id: c.id, slug: c.slug } })
    .from(i).innerJoin(c, eq(c.id, i.companionId)).where(and(eq(i.id, id), eq(i.email, user.email.toLowerCase()))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'No invitation to your address has that number.' })
  const [account] = await useDB().select({ verified: tables.users.emailVerifiedAt }).from(tables.users).where(eq(tables.users.id, user.id)).limit(1)
  if (!account?.verified) throw createError({ statusCode: 403, statusMessage: 'Verify your address first (the account page sends the link), or use the link in the invitation message.' })
  return accept(user, row.invitation, row.companion)
}

async function accept(user: User, invitation: typeof tables.invitations.$inferSelect, companion: { id: number, slug: string }) {
  const status = statusOf(invitation)
  if (status !== 'waiting') {
    const why = { accepted: 'has been accepted already', expired: 'has expired; ask the editor for a new one', revoked: 'was withdrawn or replaced by a newer one' }[status]
    throw createError({ statusCode: 410, statusMessage: `This invitation ${why}.` })
  }
  if (user.email.toLowerCase() !== invitation.email.toLowerCase()) {
    throw createError({ statusCode: 403, statusMessage: `This invitation was sent to ${invitation.email}; sign in with that address (you are signed in as ${user.email}).` })
  }
  const db = useDB()
  const m = tables.memberships
  const [existing] = await db.select({ role: m.role }).from(m).where(and(eq(m.companionId, companion.id), eq(m.userId, user.id))).limit(1)
  let role: CompanionRole = invitation.role
  if (existing) {
    // Already a member: an invitation may raise the role, never lower it.
    if (!roleAtLeast(existing.role, invitation.role)) await changeMemberRole(companion.id, user.id, invitation.role)
    else role = existing.role
  }
  else {
    await insertMembership(companion.id, user.id, invitation.role)
  }
  const i = tables.invitations
  await db.update(i).set({ acceptedAt: new Date(), acceptedBy: user.id }).where(eq(i.id, invitation.id))
  // Following the link proves the address.
  await db.update(tables.users).set({ emailVerifiedAt: new Date() }).where(and(eq(tables.users.id, user.id), isNull(tables.users.emailVerifiedAt)))
  await recordEvent({ companionId: companion.id, actorId: user.id, kind: 'invitation-accepted', reason: '', detail: { role } })
  return { slug: companion.slug, role }
}

/** Invitations waiting for the account's address (the desk lists them). */
export async function invitationsWaitingFor(user: User) {
  const i = tables.invitations
  const c = tables.companions
  const rows = await useDB().select({ id: i.id, role: i.role, expiresAt: i.expiresAt, acceptedAt: i.acceptedAt, revokedAt: i.revokedAt, title: c.title, slug: c.slug })
    .from(i).innerJoin(c, eq(c.id, i.companionId))
    .where(and(eq(i.email, user.email.toLowerCase()), isNull(i.acceptedAt), isNull(i.revokedAt), gt(i.expiresAt, new Date())))
    .orderBy(desc(i.createdAt)).limit(50)
  return rows.map(r => ({ id: r.id, role: r.role, expiresAt: r.expiresAt, companion: { title: r.title, slug: r.slug } }))
}
