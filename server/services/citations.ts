// Citations of a companion and its datasets: the record the builders in shared/utils/citation.ts
// turn into BibTeX and CSL-JSON, filled from the companion, its authors and its ensembles.
import type { H3Event } from 'h3'
import { conventionLabel } from '#shared/physics/conventions'
import { ENGINE_VERSION } from '#shared/physics/version'
import type { CitationInput } from '#shared/utils/citation'
import { bibtexEntry, cslJson, LICENSE_INFO } from '#shared/utils/citation'
import type { CompanionAccess } from '../utils/guards'
import { dataPathInArchive } from './archive'
import { recordEvent } from './audit'
import { findEnsemble, listEnsembles, repositoryDirectory } from './ensembles'
import { authorNames } from './published'

type Companion = CompanionAccess['companion']
type EnsembleLike = Pick<typeof tables.ensembles.$inferSelect, 'id' | 'name' | 'fileName' | 'sha256' | 'configurationCount' | 'pointCount' | 'd' | 'setting'>

/** The version cited: the published revision, else the current head (null before the first revision). */
async function citedVersion(companion: Companion): Promise<string | null> {
  if (companion.publishedRevision) return companion.publishedRevision
  return headOid(repositoryDirectory(companion.id)).catch(() => null)
}

export function conventionOf(ensemble: Pick<EnsembleLike, 'setting' | 'd'>): string {
  const { setting } = ensemble
  return conventionLabel(setting.convention, setting.kernel, setting.geometry.kind === 'sphere' ? 2 : ensemble.d)
}

function datasetOf(ensemble: EnsembleLike): NonNullable<CitationInput['dataset']> {
  return {
    id: ensemble.id,
    name: ensemble.name,
    fileName: ensemble.fileName,
    sha256: ensemble.sha256,
    configurationCount: ensemble.configurationCount,
    pointCount: ensemble.pointCount,
    convention: conventionOf(ensemble),
  }
}

async function baseInput(event: H3Event, companion: Companion): Promise<CitationInput> {
  return {
    slug: companion.slug,
    title: companion.title,
    abstract: companion.abstract,
    manuscriptRef: companion.manuscriptRef,
    authors: await authorNames(companion),
    publishedAt: companion.state === 'published' ? companion.publishedAt ?? companion.updatedAt : null,
    version: await citedVersion(companion),
    license: companion.license,
    siteUrl: siteUrl(event),
    engineVersion: ENGINE_VERSION,
  }
}

/** The citation record of the companion, or of one of its ensembles. */
export async function citationInput(event: H3Event, companion: Companion, ensembleId?: number): Promise<CitationInput> {
  const input = await baseInput(event, companion)
  if (ensembleId === undefined) return input
  return { ...input, dataset: datasetOf(await findEnsemble(companion.id, ensembleId)) }
}

/** The engine command that recomputes an ensemble's energies, in its declared convention, from an unpacked archive. */
function energyCommand(e: EnsembleLike): string {
  const { geometry, kernel, potential } = e.setting
  const parts = ['npm run --silent engine -- energy', `--input ${dataPathInArchive(e)}`, `--geometry ${geometry.kind}`]
  if (geometry.kind !== 'sphere') parts.push(`--dim ${geometry.d}`)
  if (geometry.kind === 'torus') parts.push(`--box ${geometry.L}`)
  parts.push(`--kernel ${kernel.name}`)
  if (kernel.name === 'riesz') parts.push(`--s ${kernel.s}`)
  if (potential) parts.push(`--potential "${potential}"`)
  parts.push(`--convention '${JSON.stringify(e.setting.convention)}'`)
  return parts.join(' ')
}

/** Everything the cite page shows: licence, engine version, and each citation in both formats. */
export async function citationSheet(event: H3Event, access: CompanionAccess) {
  const { companion } = access
  const input = await baseInput(event, companion)
  const ensembles = await listEnsembles(companion.id)
  return {
    slug: companion.slug,
    title: companion.title,
    state: companion.state,
    publishedAt: input.publishedAt,
    version: input.version,
    engineVersion: ENGINE_VERSION,
    license: companion.license,
    licenseInfo: LICENSE_INFO[companion.license],
    mayChangeLicense: access.role === 'author' || access.role === 'editor',
    authors: input.authors,
    companion: { bibtex: bibtexEntry(input), cslJson: cslJson(input) },
    datasets: ensembles.map((e) => {
      const dataset = { ...input, dataset: datasetOf(e) }
      return {
        id: e.id,
        name: e.name,
        fileName: e.fileName,
        sha256: e.sha256,
        configurationCount: e.configurationCount,
        pointCount: e.pointCount,
        convention: dataset.dataset.convention,
        conventionRecord: e.setting.convention,
        archivePath: dataPathInArchive(e),
        energyCommand: energyCommand(e),
        bibtex: bibtexEntry(dataset),
        cslJson: cslJson(dataset),
      }
    }),
  }
}

/** Sets the licence; an audit entry records the change. */
export async function changeLicense(access: CompanionAccess, license: Companion['license']): Promise<{ license: Companion['license'], changed: boolean }> {
  const { companion } = access
  if (companion.license === license) return { license, changed: false }
  await useDB().transaction(async (tx) => {
    await tx.update(tables.companions).set({ license }).where(eq(tables.companions.id, companion.id))
    await recordEvent({ companionId: companion.id, actorId: access.user?.id ?? null, kind: 'license', detail: { from: companion.license, to: license } }, tx)
  })
  return { license, changed: true }
}
