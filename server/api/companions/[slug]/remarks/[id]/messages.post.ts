import { z } from 'zod'
import { replyToRemark, requireRemarkWriter } from '../../../../../services/remarks'

const remarkParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, remarkParams)
  const { body } = await readBodyWith(event, remarkReplySchema)
  const access = await requireRemarkWriter(event, slug)
  const remark = await replyToRemark(event, access, id, body)
  setResponseStatus(event, 201)
  return { remark }
})
