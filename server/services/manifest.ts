// The companion's manifest and its commits: a change of rows and the manifest commit that records it
// land together or not at all (one database transaction, one commit under the repository lock).
import { resolve } from 'node:path'
import type { User } from 'lucia'
import type { CompanionRow } from '#shared/types/db'
import type { AppDatabase } from '../utils/db'
import type { Manifest, ManifestEnsemble } from '../utils/revisions'

export type Transaction = Parameters<Parameters<AppDatabase['transaction']>[0]>[0]
type Reader = AppDatabase | Transaction

export function repositoryDirectory(companionId: number): string {
  return resolve(useRuntimeConfig().dataPath, 'repositories', String(companionId))
}

/** The commit author for an account (git forbids angle brackets and line breaks in names). */
export function authorOf(user: Pick<User, 'displayName' | 'email'>) {
  return { name: user.displayName.replace(/[<>\r\n]+/g, ' ').trim() || 'Quillfield member', email: user.email }
}

/** A revision error as the HTTP answer it stands for. */
export function revisionProblem(error: unknown): never {
  if (error instanceof RevisionError) {
    const status = error.code === 'unknown-revision' || error.code === 'no-repository' ? 404 : error.code.startsWith('invalid') ? 400 : 500
    throw createError({ statusCode: status, statusMessage: status === 404 ? 'No revision by that id in this companion.' : error.message })
  }
  throw error
}

/** The manifest of a companion as its rows say now. */
export async function buildManifest(db: Reader, companion: Pick<CompanionRow, 'id' | 'slug' | 'title'>): Promise<Manifest> {
  const e = tables.ensembles
  const c = tables.ensembleConfigurations
  const rows = await db.select().from(e).where(eq(e.companionId, companion.id)).orderBy(asc(e.id))
  const configurations = rows.length
    ? await db.select().from(c).where(inArray(c.ensembleId, rows.map(r => r.id))).orderBy(asc(c.ensembleId), asc(c.position))
    : []
  const ensembles: ManifestEnsemble[] = rows.map(row => ({
    id: row.id,
    name: row.name,
    description: row.description,
    fileName: row.fileName,
    format: row.format,
    sha256: row.sha256,
    sizeBytes: row.sizeBytes,
    objectKey: row.objectKey,
    geometry: row.setting.geometry,
    kernel: row.setting.kernel,
    potential: row.setting.potential,
    beta: row.setting.beta,
    convention: row.setting.convention,
    labels: row.setting.labels,
    configurations: configurations.filter(x => x.ensembleId === row.id).map(x => ({
      index: x.position, N: x.n, d: x.d, checksum: x.checksum, labels: x.labels,
      bbox: x.bbox, minDistance: x.minDistance,
    })),
  }))
  const computations = await db.select({
    id: tables.computations.id, name: tables.computations.name, quantity: tables.computations.quantity,
    parameters: tables.computations.parameters, ensembleIds: tables.computations.ensembleIds,
  }).from(tables.computations).where(eq(tables.computations.companionId, companion.id)).orderBy(asc(tables.computations.id))
  const figures = await db.select({
    number: tables.figures.number, title: tables.figures.title, caption: tables.figures.caption, template: tables.figures.template,
    computationIds: tables.figures.computationIds, options: tables.figures.options,
  }).from(tables.figures).where(eq(tables.figures.companionId, companion.id)).orderBy(asc(tables.figures.number))
  return { format: 'quillfield-manifest', version: 1, companion: { slug: companion.slug, title: companion.title }, ensembles, computations, figures }
}

/** Runs a change of rows together with its manifest commit: both land, or neither does. */
export async function commitChange<T>(
  companion: CompanionRow,
  user: Pick<User, 'displayName' | 'email'>,
  change: (tx: Transaction) => Promise<{
    result: T
    message: string
    /** Text files committed beside the manifest (e.g. page.md). */
    files?: Record<string, string>
    /** Runs in the same transaction once the revision is known (e.g. its audit entry). */
    afterCommit?: (tx: Transaction, revision: string, changed: boolean) => Promise<void>
  }>,
): Promise<{ result: T, revision: string }> {
  const dir = repositoryDirectory(companion.id)
  const author = authorOf(user)
  return withRepositoryLock(dir, async () => {
    await openRepository(dir, { author, companion: { slug: companion.slug, title: companion.title } })
    const before = await headOid(dir)
    let committed = false
    try {
      return await useDB().transaction(async (tx) => {
        const { result, message, files, afterCommit } = await change(tx)
        const manifest = await buildManifest(tx, companion)
        const commit = await commitManifest(dir, manifest, { author, message, files })
        committed = commit.changed
        await afterCommit?.(tx, commit.oid, commit.changed)
        return { result, revision: commit.oid }
      })
    }
    catch (error) {
      if (committed && before) await resetTo(dir, before)
      rethrowUnavailable(error, 'The database')
    }
  })
}

/** Plain-words lines for computations and figures added or removed between two manifests. */
export function definitionLines(from: Manifest, to: Manifest): string[] {
  const lines: string[] = []
  const before = new Map((from.computations ?? []).map(c => [c.id, c]))
  const after = new Map((to.computations ?? []).map(c => [c.id, c]))
  for (const [id, c] of after) if (!before.has(id)) lines.push(`Computation ${id} «${c.name}» added: ${c.quantity} over ensembles ${c.ensembleIds.join(', ')}`)
  for (const [id, c] of before) if (!after.has(id)) lines.push(`Computation ${id} «${c.name}» removed`)
  const figuresBefore = new Map((from.figures ?? []).map(f => [f.number, f]))
  const figuresAfter = new Map((to.figures ?? []).map(f => [f.number, f]))
  for (const [n, f] of figuresAfter) {
    const old = figuresBefore.get(n)
    if (!old) lines.push(`Figure ${n} «${f.title}» added (template ${f.template}, computations ${f.computationIds.join(', ')})`)
    else if (JSON.stringify(old) !== JSON.stringify(f)) lines.push(`Figure ${n} «${f.title}» changed`)
  }
  for (const [n, f] of figuresBefore) if (!figuresAfter.has(n)) lines.push(`Figure ${n} «${f.title}» removed`)
  return lines
}
