// Accounts: sign-up, sign-in checks and profile changes.
import { generateIdFromEntropySize } from 'lucia'
import type { H3Event } from 'h3'
import type { User } from 'lucia'
import type { ProfileInput, SignInInput, SignUpInput } from '#shared/utils/validation'

export interface AccountView {
  id: string
  email: string
  displayName: string
  affiliation: string
  orcid: string | null
  siteRole: User['siteRole']
}

export function accountView(user: User): AccountView {
  return {
    id: user.id,
    email: user.email,
    displayName: user.displayName,
    affiliation: user.affiliation,
    orcid: user.orcid,
    siteRole: user.siteRole,
  }
}

export async function createAccount(input: SignUpInput): Promise<string> {
  const db = useDB()
  const [existing] = await db.select({ id: tables.users.id }).from(tables.users).where(eq(tables.users.email, input.email)).limit(1)
  if (existing) {
    throw createError({
      statusCode: 409,
      statusMessage: 'A new account cannot be made with this address. If you already have one, sign in.',
      data: { fields: { email: 'A new account cannot be made with this address.' } },
    })
  }
  const id = generateIdFromEntropySize(10)
  await db.insert(tables.users).values({
    id,
    email: input.email,
    passwordHash: await hashPassword(input.password),
    displayName: input.displayName,
  })
  return id
}

const signInRefused = 'The e-mail address or the password is not right.'

/** The account id for these credentials; a refusal never says which of the two was wrong. */
export async function checkCredentials(event: H3Event, input: SignInInput): Promise<string> {
  await assertSignInAllowed(event, input.email)
  const [user] = await useDB().select({ id: tables.users.id, passwordHash: tables.users.passwordHash })
    .from(tables.users).where(eq(tables.users.email, input.email)).limit(1)
  const ok = user ? await verifyPassword(user.passwordHash, input.password) : await verifyAgainstDummy(input.password)
  if (!user || !ok) {
    await recordSignInFailure(event, input.email)
    throw createError({ statusCode: 401, statusMessage: signInRefused })
  }
  await recordSignInSuccess(event, input.email)
  return user.id
}

export async function updateProfile(userId: string, input: ProfileInput): Promise<void> {
  await useDB().update(tables.users).set({
    displayName: input.displayName,
    affiliation: input.affiliation,
    orcid: input.orcid === '' ? null : input.orcid,
    ...(input.remarkMail ? { remarkMail: input.remarkMail } : {}),
  }).where(eq(tables.users.id, userId))
}

/** How remark notifications reach the account (not part of the session's user). */
export async function remarkMailOf(userId: string): Promise<'immediate' | 'daily' | 'none'> {
  const [row] = await useDB().select({ remarkMail: tables.users.remarkMail }).from(tables.users).where(eq(tables.users.id, userId)).limit(1)
  return row?.remarkMail ?? 'immediate'
}
