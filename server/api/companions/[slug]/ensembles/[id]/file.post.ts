// Replace an ensemble's data with a corrected file: multipart/form-data with a "file" part and an
// optional "note" (why). Name, setting and number stay; the change is one revision, and the
// computations over the ensemble are queued again.
import { replaceEnsembleFile } from '../../../../../services/ensembles'

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, ensembleParams)
  const { companion, user } = await requireCompanionRole(event, slug, 'author', { tokenScope: 'ensembles:write' })
  const upload = await receiveUpload(event)
  try {
    const note = (upload.fields.note ?? '').trim()
    if (note.length > 500) throw createError({ statusCode: 422, statusMessage: 'The note has at most 500 characters.', data: { fields: { note: 'At most 500 characters.' } } })
    return await replaceEnsembleFile(companion, user!, id, upload, note)
  }
  finally {
    await upload.discard()
  }
})
