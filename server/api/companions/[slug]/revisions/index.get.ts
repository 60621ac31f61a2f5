import { repositoryDirectory } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const dir = repositoryDirectory(companion.id)
  // A companion without uploads has no repository yet, hence no revisions.
  const revisions = await listRevisions(dir, { limit: 200 }).catch((error: unknown) => {
    if (error instanceof RevisionError && error.code === 'no-repository') return []
    throw error
  })
  return { revisions }
})
