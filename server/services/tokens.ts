// API tokens of a companion: made by authors, shown once, revocable.
import type { User } from 'lucia'

export async function listTokens(companionId: number) {
  const t = tables.apiTokens
  return useDB().select({
    id: t.id, name: t.name, prefix: t.prefix, scopes: t.scopes, lastUsedAt: t.lastUsedAt, revokedAt: t.revokedAt,
    createdAt: t.createdAt, createdBy: t.createdBy, maker: tables.users.displayName,
  }).from(t).innerJoin(tables.users, eq(tables.users.id, t.createdBy)).where(eq(t.companionId, companionId)).orderBy(desc(t.createdAt))
}

export async function createToken(companionId: number, user: User, name: string, scopes: Array<'ensembles:read' | 'ensembles:write'>) {
  const { token, hash, prefix } = newToken()
  const [row] = await useDB().insert(tables.apiTokens).values({ companionId, createdBy: user.id, name, prefix, tokenHash: hash, scopes: [...new Set(scopes)] }).$returningId()
  return { id: row!.id, token, prefix, name, scopes }
}

/** Revokes a token; authors revoke their own, editors any of the companion's. */
export async function revokeToken(companionId: number, user: User, role: string, id: number) {
  const t = tables.apiTokens
  const [row] = await useDB().select().from(t).where(and(eq(t.companionId, companionId), eq(t.id, id))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'No token by that number in this companion.' })
  if (row.createdBy !== user.id && role !== 'editor') throw createError({ statusCode: 403, statusMessage: 'Only the maker of a token or an editor may revoke it.' })
  if (!row.revokedAt) await useDB().update(t).set({ revokedAt: new Date() }).where(eq(t.id, id))
}
