// Upload an ensemble: multipart/form-data with a "setting" part (JSON, see shared/utils/ensemble.ts)
// and a "file" part. The guard runs before the body is read, so nothing is received from callers
// who may not upload; the file streams to disk and is parsed in a worker thread.
import { createEnsemble } from '../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { companion, user } = await requireCompanionRole(event, slug, 'author', { tokenScope: 'ensembles:write' })
  const upload = await receiveUpload(event)
  try {
    let raw: unknown
    try {
      raw = JSON.parse(upload.fields.setting ?? '')
    }
    catch {
      throw createError({ statusCode: 422, statusMessage: 'The "setting" part must be JSON describing the ensemble.', data: { fields: { setting: 'Missing or not JSON.' } } })
    }
    const parsed = ensembleSettingSchema.safeParse(raw)
    if (!parsed.success) throw createError({ statusCode: 422, statusMessage: 'The ensemble setting is not valid.', data: { fields: fieldErrors(parsed.error) } })
    const created = await createEnsemble(companion, user!, upload, parsed.data)
    setResponseStatus(event, 201)
    return created
  }
  finally {
    await upload.discard()
  }
})
