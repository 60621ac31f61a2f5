import { ENGINE_VERSION } from '#shared/physics/version'

// Liveness and readiness: the database must answer and carry every migration of this build, and
// the object store must answer.
export default defineEventHandler(async (event) => {
  const storage = { reachable: await storageReachable() }
  try {
    const migrations = await migrationLevel()
    const ok = migrations.current && storage.reachable
    if (!ok) setResponseStatus(event, 503)
    return { status: ok ? 'ok' : 'degraded', database: { reachable: true, migrations }, storage, engineVersion: ENGINE_VERSION }
  }
  catch (error) {
    setResponseStatus(event, 503)
    const reason = error instanceof Error ? error.message : String(error)
    return { status: 'unavailable', database: { reachable: false, reason }, storage, engineVersion: ENGINE_VERSION }
  }
})
