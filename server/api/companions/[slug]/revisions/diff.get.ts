import { z } from 'zod'
import { definitionLines, repositoryDirectory, revisionProblem } from '../../../../services/manifest'

const query = z.object({ from: z.string().regex(/^[0-9a-f]{40}$/, 'Give a revision id.'), to: z.string().regex(/^[0-9a-f]{40}$/, 'Give a revision id.') })

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { from, to } = readQueryWith(event, query)
  const { companion } = await requireCompanionRole(event, slug, 'reader')
  const dir = repositoryDirectory(companion.id)
  const diff = await diffRevisions(dir, from, to).catch(revisionProblem)
  const [a, b] = await Promise.all([readManifest(dir, from), readManifest(dir, to)]).catch(revisionProblem)
  return { diff: { ...diff, lines: [...diff.lines, ...definitionLines(a, b)] } }
})
