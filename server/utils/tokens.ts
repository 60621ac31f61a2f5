// API tokens for pipelines: `qft_` + 32 random bytes (base64url). Only a SHA-256 of the token is
// stored; the person sees the token once, when it is made.
import { createHash, randomBytes } from 'node:crypto'
import type { H3Event } from 'h3'

export const TOKEN_PREFIX = 'qft_'

export function newToken(): { token: string, hash: string, prefix: string } {
  const token = `${TOKEN_PREFIX}${randomBytes(32).toString('base64url')}`
  return { token, hash: hashToken(token), prefix: token.slice(0, 12) }
}

export function hashToken(token: string): string {
  return createHash('sha256').update(token).digest('hex')
}

export interface TokenContext {
  id: number
  companionId: number
  scopes: string[]
  userId: string
}

/** Reads `Authorization: Bearer qft_…`; undefined when the request carries no token. */
export async function tokenFromRequest(event: H3Event): Promise<TokenContext | undefined> {
  const header = getRequestHeader(event, 'authorization')
  if (!header?.startsWith('Bearer ')) return undefined
  const token = header.slice(7).trim()
  if (!token.startsWith(TOKEN_PREFIX)) throw createError({ statusCode: 401, statusMessage: 'That is not a Quillfield API token.' })
  const t = tables.apiTokens
  const [row] = await useDB().select().from(t).where(eq(t.tokenHash, hashToken(token))).limit(1)
  if (!row || row.revokedAt) throw createError({ statusCode: 401, statusMessage: 'This API token is not valid (revoked or unknown).' })
  await useDB().update(t).set({ lastUsedAt: new Date() }).where(eq(t.id, row.id))
  return { id: row.id, companionId: row.companionId, scopes: row.scopes, userId: row.createdBy }
}
