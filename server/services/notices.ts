// Remark notifications go "to the other side" of the review: what a reviewer writes reaches the
// companion's authors and editors; what an author or editor writes reaches the reviewer who opened
// the thread, the reviewers who wrote in it, and the editors. The writer is never notified. Each
// recipient's text names people as that recipient may see them (`nameFor` from their own access).
// Accounts choose how: at once ('immediate'), in a daily digest ('daily', queued in pending_notice)
// or not at all ('none').
import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { CompanionRole } from '#shared/types/roles'
import type { CompanionAccess } from '../utils/guards'
import type { MailPart } from '../utils/mail'
import { nameFor, peopleOf, personFor } from './identity'

type RemarkRow = typeof tables.remarks.$inferSelect
type UserRow = typeof tables.users.$inferSelect

function excerpt(body: string, limit = 600): string {
  const flat = body.trim()
  return flat.length > limit ? `${flat.slice(0, limit - 1)}…` : flat
}

/** The link to a remark on its figure's page. */
export function remarkLink(base: string, slug: string, remark: Pick<RemarkRow, 'id' | 'figureNumber'>): string {
  return `${base.replace(/\/+$/, '')}/c/${slug}/figures/${remark.figureNumber}#remark-${remark.id}`
}

/** The accounts to tell about a new message in a thread, by the writer's side of the review. */
async function recipientsOf(access: CompanionAccess, remark: RemarkRow): Promise<Array<{ user: UserRow, role: CompanionRole | null }>> {
  const db = useDB()
  const m = tables.memberships
  const members = await db.select({ userId: m.userId, role: m.role }).from(m).where(eq(m.companionId, access.companion.id))
  const writerId = access.user!.id
  const ids = new Set<string>()
  if (access.role === 'reviewer') {
    for (const x of members) if (x.role === 'author' || x.role === 'editor') ids.add(x.userId)
  }
  else {
    const writers = await db.selectDistinct({ authorId: tables.remarkMessages.authorId }).from(tables.remarkMessages)
      .where(eq(tables.remarkMessages.remarkId, remark.id))
    const inThread = new Set([remark.authorId, ...writers.map(w => w.authorId)].filter((v): v is string => Boolean(v)))
    for (const x of members) {
      if (x.role === 'editor') ids.add(x.userId)
      if (x.role === 'reviewer' && inThread.has(x.userId)) ids.add(x.userId)
    }
  }
  ids.delete(writerId)
  if (!ids.size) return []
  const users = await db.select().from(tables.users).where(inArray(tables.users.id, [...ids]))
  return users.map(user => ({ user, role: members.find(x => x.userId === user.id)?.role ?? null }))
}

function accessOf(companion: CompanionAccess['companion'], user: UserRow, membershipRole: CompanionRole | null): CompanionAccess {
  const asUser: User = { id: user.id, email: user.email, displayName: user.displayName, affiliation: user.affiliation, orcid: user.orcid, siteRole: user.siteRole }
  const role: CompanionRole = user.siteRole === 'admin' ? 'editor' : (membershipRole ?? 'reader')
  return { companion, role, membershipRole, user: asUser }
}

/** Tells the other side about a new remark or reply: a message now, a queued notice, or nothing, as each recipient chose. */
export async function notifyRemark(event: H3Event, access: CompanionAccess, remark: RemarkRow, message: { body: string, opening: boolean }): Promise<{ mailed: number, queued: number, failed: number }> {
  const counts = { mailed: 0, queued: 0, failed: 0 }
  const recipients = await recipientsOf(access, remark)
  if (!recipients.length) return counts
  const people = await peopleOf(access.companion.id)
  const writer = await personFor(people, access.user!.id)
  const link = remarkLink(siteUrl(event), access.companion.slug, remark)
  for (const { user, role } of recipients) {
    if (user.remarkMail === 'none') continue
    const shownWriter = nameFor(accessOf(access.companion, user, role), writer).name
    const what = message.opening ? 'opened a remark on' : 'replied to a remark on'
    const subject = `${shownWriter} ${what} figure ${remark.figureNumber} of «${access.companion.title}»`
    const text = `${shownWriter} ${what} figure ${remark.figureNumber} of the companion «${access.companion.title}»:\n\n${excerpt(message.body)}`
    if (user.remarkMail === 'daily') {
      await useDB().insert(tables.pendingNotices).values({ userId: user.id, companionId: access.companion.id, subject: subject.slice(0, 300), text, link })
      counts.queued++
      continue
    }
    const sent = await trySendMail(composeMail(user.email, subject, [text, { link, label: 'Open the remark' }, 'You get these messages because you take part in this companion. Choose daily digests or none on your account page.']))
    if (sent.mailed) counts.mailed++
    else counts.failed++
  }
  return counts
}

/** The account's key for the unsubscribe link, made when it has none yet. */
async function mailKeyOf(user: Pick<UserRow, 'id' | 'mailKey'>): Promise<string> {
  if (user.mailKey) return user.mailKey
  const key = randomBytes(24).toString('base64url')
  await useDB().update(tables.users).set({ mailKey: key }).where(and(eq(tables.users.id, user.id), eq(tables.users.mailKey, '')))
  const [row] = await useDB().select({ mailKey: tables.users.mailKey }).from(tables.users).where(eq(tables.users.id, user.id)).limit(1)
  return row?.mailKey || key
}

export interface DigestCounts {
  /** Accounts that were sent a digest. */
  digests: number
  /** Notices those digests held. */
  notices: number
  /** Notices dropped because their account chose no remark mail since they were queued. */
  dropped: number
  /** Digests the mail server did not take (their notices stay queued for the next round). */
  failed: number
}

/**
 * Sends every account with unsent notices one digest of them (plain text and HTML, with an
 * unsubscribe link to `<base>/mail/stop?key=<mail key>`), and marks the notices sent. Notices are
 * claimed before sending, so two servers never send the same ones; a digest the mail server
 * refuses gives its notices back.
 */
export async function sendDigests(baseUrl: string): Promise<DigestCounts> {
  const base = baseUrl.replace(/\/+$/, '')
  const db = useDB()
  const p = tables.pendingNotices
  const counts: DigestCounts = { digests: 0, notices: 0, dropped: 0, failed: 0 }
  const waiting = await db.select().from(p).where(sql`${p.sentAt} IS NULL`).orderBy(asc(p.userId), asc(p.createdAt), asc(p.id))
  const byUser = new Map<string, typeof waiting>()
  for (const n of waiting) byUser.set(n.userId, [...(byUser.get(n.userId) ?? []), n])
  for (const [userId, notices] of byUser) {
    const ids = notices.map(n => n.id)
    // datetime columns keep whole seconds: claim with a whole-second time so it can be matched again.
    const claimedAt = new Date(Math.floor(Date.now() / 1000) * 1000)
    const [claim] = await db.update(p).set({ sentAt: claimedAt }).where(and(inArray(p.id, ids), sql`${p.sentAt} IS NULL`))
    if (claim.affectedRows !== ids.length) {
      // Another server took some of them: give back what this one took and leave them to it.
      await db.update(p).set({ sentAt: null }).where(and(inArray(p.id, ids), eq(p.sentAt, claimedAt)))
      continue
    }
    const [user] = await db.select().from(tables.users).where(eq(tables.users.id, userId)).limit(1)
    if (!user || user.remarkMail === 'none') {
      counts.dropped += ids.length
      continue
    }
    const key = await mailKeyOf(user)
    const parts: MailPart[] = [`${notices.length === 1 ? 'One thing' : `${notices.length} things`} happened in remarks since your last digest:`]
    for (const n of notices) {
      parts.push(`${n.subject}\n\n${n.text}`)
      parts.push({ link: n.link, label: 'Open the remark' })
    }
    const subject = `Quillfield digest: ${notices.length} remark ${notices.length === 1 ? 'notice' : 'notices'}`
    try {
      await sendMail(composeMail(user.email, subject, parts, `${base}/mail/stop?key=${encodeURIComponent(key)}`))
      counts.digests++
      counts.notices += ids.length
    }
    catch (error) {
      console.error(`[digest] mail to account ${userId} failed:`, (error as { statusMessage?: string }).statusMessage ?? (error as Error).message)
      await db.update(p).set({ sentAt: null }).where(inArray(p.id, ids))
      counts.failed++
    }
  }
  return counts
}

/** Turns remark mail off for the account with this unsubscribe key; false when no account has it. */
export async function stopRemarkMail(key: string): Promise<boolean> {
  if (!key) return false
  const [user] = await useDB().select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.mailKey, key)).limit(1)
  if (!user) return false
  await useDB().update(tables.users).set({ remarkMail: 'none' }).where(eq(tables.users.id, user.id))
  return true
}
