import { z } from 'zod'
import { repositoryDirectory, revisionProblem } from '../../../../services/ensembles'

const query = z.object({ from: z.string().regex(/^[0-9a-f]{40}$/, 'Give a revision id.'), to: z.string().regex(/^[0-9a-f]{40}$/, 'Give a revision id.') })

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { from, to } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  return { diff: await diffRevisions(repositoryDirectory(companion.id), from, to).catch(revisionProblem) }
})
