import { listEnsembles } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion } = await requireCompanionRole(event, slug, 'reader', { tokenScope: 'ensembles:read' })
  return { ensembles: await listEnsembles(companion.id) }
})
