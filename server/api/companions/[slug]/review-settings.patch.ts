import { changeReviewSettings } from '../../../services/course'

// The editor opens or closes reviewers' identities and decides whether remarks are published.
export default defineEventHandler(async (event) => {
  const { slug } = readParamsWith(event, slugParams)
  const input = await readBodyWith(event, reviewSettingsSchema)
  const access = await requireCompanionRole(event, slug, 'editor')
  return changeReviewSettings(access, input)
})
