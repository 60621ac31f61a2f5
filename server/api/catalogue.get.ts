// The quantities a computation can evaluate, with their parameters (from the engine's commands).
import { catalogue } from '../../cli/catalogue'
import { ENGINE_VERSION } from '#shared/physics/version'

export default defineEventHandler(() => ({
  engineVersion: ENGINE_VERSION,
  quantities: catalogue.map(q => ({ id: q.id, title: q.title, parameters: q.parameters, perConfiguration: q.perConfiguration })),
}))
