import { createRemark, requireRemarkWriter } from '../../../../services/remarks'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, remarkCreateSchema)
  const access = await requireRemarkWriter(event, slug)
  const remark = await createRemark(event, access, input)
  setResponseStatus(event, 201)
  return { remark }
})
