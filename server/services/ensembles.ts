// Ensembles: storing an upload atomically (object, rows and manifest commit, or none of them),
// changing what an ensemble declares, removing it, and rebuilding rows from a restored revision.
import { createReadStream } from 'node:fs'
import type { User } from 'lucia'
import type { CompanionRow } from '#shared/types/db'
import type { EnsembleSettingInput } from '#shared/utils/ensemble'
import type { EnsembleSettingRecord } from '../db/schema'
import { parsePotential } from '#shared/physics/potentials/expression'
import { EngineInputError } from '#shared/physics/errors'
import { requeueAffected } from './computations'
import { commitChange, repositoryDirectory, revisionProblem } from './manifest'

export { repositoryDirectory, revisionProblem } from './manifest'

/** Checks the potential text with the engine's expression parser; a 422 on the field otherwise. */
export function checkPotential(setting: Pick<EnsembleSettingInput, 'potential' | 'geometry'>): void {
  if (!setting.potential || setting.geometry.kind !== 'free') return
  try {
    parsePotential(setting.potential, { d: setting.geometry.d })
  }
  catch (error) {
    const message = error instanceof EngineInputError ? error.message : 'The potential could not be read.'
    throw createError({ statusCode: 422, statusMessage: `The potential is not valid: ${message}`, data: { fields: { potential: message } } })
  }
}

function settingRecord(input: EnsembleSettingInput): EnsembleSettingRecord {
  return {
    geometry: input.geometry,
    kernel: input.kernel,
    potential: input.potential ?? null,
    beta: input.beta ?? null,
    convention: input.convention,
    labels: input.labels,
  }
}

interface ParsedUpload {
  ok: true
  format: 'text' | 'json' | 'npy' | 'zip'
  d: number
  configurations: Array<{ N: number, d: number, bbox: { min: number[], max: number[] }, minDistance: number | null, checksum: string }>
  labels: Array<Record<string, string | number>>
  warnings: string[]
  preview: { d: number, points: number[][] }
}
interface RejectedUpload {
  ok: false
  error: { message: string, where: Record<string, unknown> }
}

/** Reads and checks an upload in a worker thread; a bad file is a 422 saying where it goes wrong. */
async function parseUpload(upload: ReceivedUpload, geometry: EnsembleSettingRecord['geometry']): Promise<ParsedUpload> {
  const parsed = await useWorkerPool('parse-ensemble').run({ path: upload.path, fileName: upload.fileName, geometry }) as ParsedUpload | RejectedUpload
  if (!parsed.ok) {
    throw createError({ statusCode: 422, statusMessage: parsed.error.message, data: { where: parsed.error.where, fields: { file: parsed.error.message } } })
  }
  return parsed
}

/** Puts the upload's bytes in object storage under their SHA-256; true when this call created the object. */
async function storeObject(upload: ReceivedUpload): Promise<{ objectKey: string, createdObject: boolean }> {
  const objectKey = objectKeyFor(upload.sha256)
  try {
    if (await objectExists(objectKey)) return { objectKey, createdObject: false }
    await putObject(objectKey, createReadStream(upload.path))
    return { objectKey, createdObject: true }
  }
  catch (error) {
    storageUnavailable(error)
  }
}

/** After a failed commit: deletes an object this change created, unless a row names it. */
async function dropUnusedObject(objectKey: string, createdObject: boolean): Promise<void> {
  if (!createdObject) return
  const [stillUsed] = await useDB().select({ id: tables.ensembles.id }).from(tables.ensembles).where(eq(tables.ensembles.objectKey, objectKey)).limit(1).catch(() => [{ id: 0 }])
  if (!stillUsed) await deleteObject(objectKey).catch(() => undefined)
}

type ConfigurationWriter = Pick<ReturnType<typeof useDB>, 'insert'>

async function insertConfigurations(tx: ConfigurationWriter, ensembleId: number, parsed: ParsedUpload): Promise<void> {
  for (let start = 0; start < parsed.configurations.length; start += 500) {
    await tx.insert(tables.ensembleConfigurations).values(parsed.configurations.slice(start, start + 500).map((c, k) => ({
      ensembleId,
      position: start + k,
      n: c.N,
      d: c.d,
      checksum: c.checksum,
      bbox: c.bbox,
      minDistance: c.minDistance,
      labels: parsed.labels[start + k] ?? {},
    })))
  }
}

async function refuseDuplicate(companionId: number, sha256: string): Promise<void> {
  const [duplicate] = await useDB().select({ id: tables.ensembles.id, name: tables.ensembles.name }).from(tables.ensembles)
    .where(and(eq(tables.ensembles.companionId, companionId), eq(tables.ensembles.sha256, sha256))).limit(1)
    .catch(error => rethrowUnavailable(error, 'The database'))
  if (duplicate) {
    throw createError({
      statusCode: 409,
      statusMessage: `This file is already stored here as ensemble «${duplicate.name}» (same SHA-256).`,
      data: { existing: duplicate, fields: { file: `Already stored as «${duplicate.name}».` } },
    })
  }
}

/**
 * Replaces the data of an ensemble with a corrected file (same name, setting and number), as one
 * revision; the computations over it are queued again, and their figures follow.
 */
export async function replaceEnsembleFile(companion: CompanionRow, user: Pick<User, 'id' | 'displayName' | 'email'>, id: number, upload: ReceivedUpload, note: string) {
  const before = await findEnsemble(companion.id, id)
  const parsed = await parseUpload(upload, before.setting.geometry)
  await refuseDuplicate(companion.id, upload.sha256)
  const { objectKey, createdObject } = await storeObject(upload)
  const db = useDB()
  try {
    const { revision } = await commitChange(companion, user, async (tx) => {
      await tx.update(tables.ensembles).set({
        fileName: upload.fileName,
        format: parsed.format,
        sha256: upload.sha256,
        sizeBytes: upload.sizeBytes,
        objectKey,
        d: parsed.d,
        configurationCount: parsed.configurations.length,
        pointCount: parsed.configurations.reduce((n, c) => n + c.N, 0),
        uploadedBy: user.id,
        preview: parsed.preview,
      }).where(eq(tables.ensembles.id, id))
      await tx.delete(tables.ensembleConfigurations).where(eq(tables.ensembleConfigurations.ensembleId, id))
      await insertConfigurations(tx, id, parsed)
      const why = note ? `: ${note}` : ''
      return { result: id, message: `Replace the data of ensemble «${before.name}» with ${upload.fileName} (${parsed.configurations.length} configuration${parsed.configurations.length === 1 ? '' : 's'})${why}` }
    })
    await db.update(tables.ensembles).set({ revision }).where(eq(tables.ensembles.id, id))
    const requeued = await requeueAffected(companion.id)
    return { id, revision, warnings: parsed.warnings, preview: parsed.preview, requeued }
  }
  catch (error) {
    await dropUnusedObject(objectKey, createdObject)
    throw error
  }
}

export async function createEnsemble(companion: CompanionRow, user: Pick<User, 'id' | 'displayName' | 'email'>, upload: ReceivedUpload, setting: EnsembleSettingInput) {
  checkPotential(setting)
  const parsed = await parseUpload(upload, setting.geometry)
  const db = useDB()
  await refuseDuplicate(companion.id, upload.sha256)
  const { objectKey, createdObject } = await storeObject(upload)
  const pointCount = parsed.configurations.reduce((n, c) => n + c.N, 0)
  try {
    const { result: id, revision } = await commitChange(companion, user, async (tx) => {
      const [row] = await tx.insert(tables.ensembles).values({
        companionId: companion.id,
        name: setting.name,
        description: setting.description,
        fileName: upload.fileName,
        format: parsed.format,
        sha256: upload.sha256,
        sizeBytes: upload.sizeBytes,
        objectKey,
        d: parsed.d,
        configurationCount: parsed.configurations.length,
        pointCount,
        setting: settingRecord(setting),
        uploadedBy: user.id,
        revision: '',
        preview: parsed.preview,
      }).$returningId()
      if (!row) throw new Error('the ensemble row was not stored')
      await insertConfigurations(tx, row.id, parsed)
      return { result: row.id, message: `Add ensemble «${setting.name}»: ${parsed.configurations.length} configuration${parsed.configurations.length === 1 ? '' : 's'} from ${upload.fileName}` }
    })
    await db.update(tables.ensembles).set({ revision }).where(eq(tables.ensembles.id, id))
    return { id, revision, warnings: parsed.warnings, preview: parsed.preview }
  }
  catch (error) {
    await dropUnusedObject(objectKey, createdObject)
    throw error
  }
}

export async function listEnsembles(companionId: number) {
  const e = tables.ensembles
  return useDB().select({
    id: e.id, name: e.name, fileName: e.fileName, format: e.format, sha256: e.sha256, sizeBytes: e.sizeBytes,
    d: e.d, configurationCount: e.configurationCount, pointCount: e.pointCount, setting: e.setting, revision: e.revision,
    createdAt: e.createdAt, updatedAt: e.updatedAt,
  }).from(e).where(eq(e.companionId, companionId)).orderBy(asc(e.id))
}

export async function findEnsemble(companionId: number, id: number) {
  const [row] = await useDB().select().from(tables.ensembles)
    .where(and(eq(tables.ensembles.companionId, companionId), eq(tables.ensembles.id, id))).limit(1)
  if (!row) throw createError({ statusCode: 404, statusMessage: 'No ensemble by that number in this companion.' })
  return row
}

export async function ensembleConfigurations(ensembleId: number) {
  const c = tables.ensembleConfigurations
  return useDB().select({ position: c.position, n: c.n, d: c.d, checksum: c.checksum, bbox: c.bbox, minDistance: c.minDistance, labels: c.labels })
    .from(c).where(eq(c.ensembleId, ensembleId)).orderBy(asc(c.position)).limit(10_000)
}

export async function updateEnsemble(companion: CompanionRow, user: Pick<User, 'displayName' | 'email'>, id: number, patch: Partial<EnsembleSettingRecord> & { name?: string, description?: string }) {
  const before = await findEnsemble(companion.id, id)
  const setting: EnsembleSettingRecord = {
    ...before.setting,
    ...(patch.potential !== undefined ? { potential: patch.potential } : {}),
    ...(patch.beta !== undefined ? { beta: patch.beta } : {}),
    ...(patch.convention !== undefined ? { convention: patch.convention } : {}),
    ...(patch.labels !== undefined ? { labels: patch.labels } : {}),
  }
  checkPotential({ potential: setting.potential, geometry: setting.geometry })
  const changed = Object.keys(patch).filter(k => (patch as Record<string, unknown>)[k] !== undefined)
  const change = await commitChange(companion, user, async (tx) => {
    await tx.update(tables.ensembles).set({
      setting,
      ...(patch.name !== undefined ? { name: patch.name } : {}),
      ...(patch.description !== undefined ? { description: patch.description } : {}),
    }).where(eq(tables.ensembles.id, id))
    return { result: id, message: `Change ${changed.join(', ') || 'nothing'} of ensemble «${patch.name ?? before.name}»` }
  })
  await requeueAffected(companion.id)
  return change
}

export async function removeEnsemble(companion: CompanionRow, user: Pick<User, 'displayName' | 'email'>, id: number) {
  const before = await findEnsemble(companion.id, id)
  const change = await commitChange(companion, user, async (tx) => {
    await tx.delete(tables.ensembles).where(eq(tables.ensembles.id, id))
    return { result: id, message: `Remove ensemble «${before.name}» (its data stays in earlier revisions)` }
  })
  await requeueAffected(companion.id)
  return change
}

/** Makes the rows match a restored manifest; objects are content-addressed and never deleted. */
export async function restoreCompanionRevision(companion: CompanionRow, user: Pick<User, 'id' | 'displayName' | 'email'>, oid: string) {
  const dir = repositoryDirectory(companion.id)
  const manifest = await readManifest(dir, oid).catch(revisionProblem)
  // The page text comes back with the data (revisions from before the page existed had none).
  const pageText = (await readRevisionFile(dir, oid, 'page.md').catch(revisionProblem)) ?? ''
  const short = oid.slice(0, 8)
  const change = await commitChange(companion, user, async (tx) => {
    await tx.update(tables.companions).set({ pageText }).where(eq(tables.companions.id, companion.id))
    await tx.delete(tables.ensembles).where(eq(tables.ensembles.companionId, companion.id))
    for (const e of manifest.ensembles) {
      const [row] = await tx.insert(tables.ensembles).values({
        id: e.id,
        companionId: companion.id,
        name: e.name,
        description: e.description ?? '',
        fileName: e.fileName,
        format: e.format,
        sha256: e.sha256,
        sizeBytes: e.sizeBytes,
        objectKey: e.objectKey,
        d: e.configurations[0]?.d ?? 0,
        configurationCount: e.configurations.length,
        pointCount: e.configurations.reduce((n, c) => n + c.N, 0),
        setting: { geometry: e.geometry, kernel: e.kernel, potential: e.potential, beta: e.beta, convention: e.convention, labels: e.labels } as EnsembleSettingRecord,
        uploadedBy: user.id,
        revision: oid,
      }).$returningId()
      if (!row) throw new Error('a restored ensemble was not stored')
      for (let start = 0; start < e.configurations.length; start += 500) {
        await tx.insert(tables.ensembleConfigurations).values(e.configurations.slice(start, start + 500).map(c => ({
          ensembleId: row.id,
          position: c.index,
          n: c.N,
          d: c.d,
          checksum: c.checksum,
          bbox: (c.bbox ?? { min: [], max: [] }) as { min: number[], max: number[] },
          minDistance: (c.minDistance ?? null) as number | null,
          labels: c.labels as Record<string, string | number>,
        })))
      }
    }
    return { result: manifest.ensembles.length, message: `Restore revision ${short}`, files: { 'page.md': pageText } }
  })
  await requeueAffected(companion.id)
  return change
}
