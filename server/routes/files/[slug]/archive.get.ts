// GET /files/<slug>/archive?revision=<oid>: the whole companion at a revision (default: the latest).
import { z } from 'zod'
import { repositoryDirectory, revisionProblem } from '../../../services/ensembles'
import { streamArchive } from '../../../services/archive'

const query = z.object({ revision: z.string().regex(/^[0-9a-f]{40}$/, 'A revision is a 40-character commit id.').optional() })

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { revision: asked } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  const dir = repositoryDirectory(companion.id)
  const revision = asked ?? await headOid(dir).catch(() => null)
  if (!revision) throw createError({ statusCode: 404, statusMessage: 'This companion has no revision yet: upload an ensemble first.' })
  const manifest = await readManifest(dir, revision).catch(revisionProblem)
  const pageText = await readRevisionFile(dir, revision, 'page.md').catch(revisionProblem)
  setResponseHeaders(event, {
    'Content-Type': 'application/zip',
    'Content-Disposition': `attachment; filename="${companion.slug}-${revision.slice(0, 8)}.zip"`,
  })
  return sendStream(event, await streamArchive(companion, manifest, revision, pageText))
})
