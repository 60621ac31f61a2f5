import { ENGINE_VERSION } from '#shared/physics/version'

// Liveness and readiness: the database must answer and carry every migration of this build.
export default defineEventHandler(async (event) => {
  try {
    const migrations = await migrationLevel()
    if (!migrations.current) setResponseStatus(event, 503)
    return { status: migrations.current ? 'ok' : 'degraded', database: { reachable: true, migrations }, engineVersion: ENGINE_VERSION }
  }
  catch (error) {
    setResponseStatus(event, 503)
    const reason = error instanceof Error ? error.message : String(error)
    return { status: 'unavailable', database: { reachable: false, reason }, engineVersion: ENGINE_VERSION }
  }
})
