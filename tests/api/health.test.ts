import { describe, expect, it } from 'vitest'
import { ApiClient } from '../support/http'

describe('GET /api/health', () => {
  it('reports the database reachable and every migration applied', async () => {
    const reply = await new ApiClient().get<{ status: string, database: { reachable: boolean, migrations: { applied: number, expected: number, current: boolean, latest: string } }, storage: { reachable: boolean }, engineVersion: string }>('/api/health')
    expect(reply.status).toBe(200)
    expect(reply.body.status).toBe('ok')
    expect(reply.body.database.reachable).toBe(true)
    expect(reply.body.storage.reachable).toBe(true)
    expect(reply.body.database.migrations.applied).toBe(reply.body.database.migrations.expected)
    expect(reply.body.database.migrations.applied).toBeGreaterThan(0)
    expect(reply.body.database.migrations.latest).toMatch(/^\d{4}_/)
    expect(reply.body.engineVersion).toMatch(/^\d+\.\d+\.\d+$/)
  })
})
