import { z } from 'zod'
import { findRemark, requireRemarkReader } from '../../../../../services/remarks'

const remarkParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, remarkParams)
  const access = await requireRemarkReader(event, slug)
  return { remark: await findRemark(access, id) }
})
