// Links sent by e-mail for accounts: password reset (one hour) and address verification (two days).
// Tokens are 32 random bytes; only their SHA-256 is stored; each works once.
import { randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'
import type { User } from 'lucia'

const LIFETIME_MS = { password_reset: 3600 * 1000, verify_email: 48 * 3600 * 1000 } as const
/** At most this many unused links of one kind per account per hour (a mailbox is not a target). */
const PER_HOUR = 3

type Purpose = keyof typeof LIFETIME_MS

async function issue(userId: string, purpose: Purpose): Promise<string | null> {
  const t = tables.accountTokens
  const [recent] = await useDB().select({ n: count() }).from(t)
    .where(and(eq(t.userId, userId), eq(t.purpose, purpose), gt(t.createdAt, new Date(Date.now() - 3600 * 1000))))
  if ((recent?.n ?? 0) >= PER_HOUR) return null
  const token = randomBytes(32).toString('base64url')
  await useDB().insert(t).values({ userId, purpose, tokenHash: hashToken(token), expiresAt: new Date(Date.now() + LIFETIME_MS[purpose]) })
  return token
}

/** Takes a link's token: the account it belongs to, once; afterwards the token is spent. */
async function redeem(token: string, purpose: Purpose): Promise<string> {
  const t = tables.accountTokens
  return useDB().transaction(async (tx) => {
    const [row] = await tx.select().from(t).where(and(eq(t.tokenHash, hashToken(token)), eq(t.purpose, purpose))).limit(1)
    const what = purpose === 'password_reset' ? 'password link' : 'verification link'
    if (!row) throw createError({ statusCode: 404, statusMessage: `That ${what} is not known. Ask for a new one.` })
    if (row.usedAt) throw createError({ statusCode: 410, statusMessage: `That ${what} has been used already. Ask for a new one.` })
    if (row.expiresAt.getTime() <= Date.now()) throw createError({ statusCode: 410, statusMessage: `That ${what} has expired. Ask for a new one.` })
    const [spent] = await tx.update(t).set({ usedAt: new Date() }).where(and(eq(t.id, row.id), isNull(t.usedAt)))
    if (spent.affectedRows !== 1) throw createError({ statusCode: 410, statusMessage: `That ${what} has been used already. Ask for a new one.` })
    return row.userId
  })
}

/**
 * Sends a password link when an account has this address. The answer is the same either way,
 * so the form does not tell who has an account.
 */
export async function requestPasswordReset(event: H3Event, email: string): Promise<void> {
  const [account] = await useDB().select({ id: tables.users.id, displayName: tables.users.displayName })
    .from(tables.users).where(eq(tables.users.email, email)).limit(1)
  if (!account) return
  const token = await issue(account.id, 'password_reset')
  if (!token) return
  await trySendMail(composeMail(email, 'Choose a new Quillfield password', [
    `Dear ${account.displayName},`,
    'Someone (we hope you) asked to choose a new password for the Quillfield account with this address.',
    { link: `${siteUrl(event)}/reset-password?token=${token}`, label: 'Choose a new password' },
    'The link works once, for one hour. If you did not ask, ignore this message: your password stays as it is.',
  ]))
}

/** Sets the new password and ends every session of the account (a stolen session ends too). */
export async function resetPassword(token: string, password: string): Promise<string> {
  const userId = await redeem(token, 'password_reset')
  await useDB().update(tables.users).set({ passwordHash: await hashPassword(password), emailVerifiedAt: sql`COALESCE(${tables.users.emailVerifiedAt}, NOW())` })
    .where(eq(tables.users.id, userId))
  await useLucia().invalidateUserSessions(userId)
  return userId
}

/** Sends an address-verification link to the account's address; false when too many were sent this hour. */
export async function sendVerification(event: H3Event, user: Pick<User, 'id' | 'email' | 'displayName'>): Promise<{ sent: boolean, mailed: boolean, mailError?: string }> {
  const token = await issue(user.id, 'verify_email')
  if (!token) return { sent: false, mailed: false, mailError: 'Three links were sent in the last hour; use one of those or try again later.' }
  const mail = await trySendMail(composeMail(user.email, 'Confirm your address for Quillfield', [
    `Dear ${user.displayName},`,
    'Please confirm that this address belongs to your Quillfield account. Editors invite you by it, and remark notices come to it.',
    { link: `${siteUrl(event)}/verify-email?token=${token}`, label: 'Confirm this address' },
    'The link works once, for two days.',
  ]))
  return { sent: true, ...mail }
}

export async function verifyAddress(token: string): Promise<void> {
  const userId = await redeem(token, 'verify_email')
  await useDB().update(tables.users).set({ emailVerifiedAt: new Date() }).where(and(eq(tables.users.id, userId), isNull(tables.users.emailVerifiedAt)))
}

export async function addressStatus(user: User): Promise<{ email: string, verified: boolean, verifiedAt: Date | null }> {
  const [row] = await useDB().select({ at: tables.users.emailVerifiedAt }).from(tables.users).where(eq(tables.users.id, user.id)).limit(1)
  return { email: user.email, verified: Boolean(row?.at), verifiedAt: row?.at ?? null }
}
