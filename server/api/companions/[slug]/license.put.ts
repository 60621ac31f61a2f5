// PUT /api/companions/<slug>/license { license }: the authors' choice of licence for the companion's data.
import { licenseSchema } from '#shared/utils/citation'
import { changeLicense } from '../../../services/citations'

export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const { license } = await readBodyWith(event, licenseSchema)
  const access = await requireCompanionRole(event, slug, 'author')
  return changeLicense(access, license)
})
