import { restoreCompanionRevision } from '../../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug, oid } = readParamsWith(event, revisionParams)
  const { companion, user } = await requireCompanionRole(event, slug, 'author')
  const { revision } = await restoreCompanionRevision(companion, user!, oid)
  return { revision }
})
