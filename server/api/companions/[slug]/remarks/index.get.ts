import { listRemarks, requireRemarkReader } from '../../../../services/remarks'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const filter = readQueryWith(event, remarkListQuerySchema)
  const access = await requireRemarkReader(event, slug)
  return { remarks: await listRemarks(access, filter) }
})
