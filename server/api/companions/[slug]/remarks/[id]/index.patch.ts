import { z } from 'zod'
import { requireRemarkWriter, setRemarkState } from '../../../../../services/remarks'

const remarkParams = z.object({ slug: slugSchema, id: z.coerce.number().int().positive() })

export default defineEventHandler(async (event) => {
  const { slug, id } = readParamsWith(event, remarkParams)
  const { state } = await readBodyWith(event, remarkStateSchema)
  const access = await requireRemarkWriter(event, slug)
  return { remark: await setRemarkState(access, id, state) }
})
