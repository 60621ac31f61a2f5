// Sessions with lucia v3 on the Drizzle adapter (MariaDB).
import { DrizzleMySQLAdapter } from '@lucia-auth/adapter-drizzle'
import { Lucia } from 'lucia'
import type { H3Event } from 'h3'
import type { SiteRole } from '#shared/types/roles'

function createLucia() {
  const adapter = new DrizzleMySQLAdapter(useDB(), tables.sessions, tables.users)
  const config = useRuntimeConfig()
  return new Lucia(adapter, {
    sessionCookie: {
      name: 'qf_session',
      attributes: {
        secure: config.deployment === 'production',
        sameSite: 'lax',
      },
    },
    getUserAttributes: attributes => ({
      email: attributes.email,
      displayName: attributes.displayName,
      affiliation: attributes.affiliation,
      orcid: attributes.orcid,
      siteRole: attributes.siteRole,
    }),
  })
}

type AppLucia = ReturnType<typeof createLucia>

declare module 'lucia' {
  interface Register {
    Lucia: AppLucia
    DatabaseUserAttributes: {
      email: string
      displayName: string
      affiliation: string
      orcid: string | null
      siteRole: SiteRole
    }
  }
}

let lucia: AppLucia | undefined

export function useLucia(): AppLucia {
  lucia ??= createLucia()
  return lucia
}

/** Starts a session for the account and sets its cookie (HttpOnly, SameSite=Lax, Secure in production). */
export async function startSession(event: H3Event, userId: string): Promise<void> {
  const auth = useLucia()
  const session = await auth.createSession(userId, {})
  appendResponseHeader(event, 'Set-Cookie', auth.createSessionCookie(session.id).serialize())
}

export async function endSession(event: H3Event): Promise<void> {
  const auth = useLucia()
  if (event.context.session) await auth.invalidateSession(event.context.session.id)
  appendResponseHeader(event, 'Set-Cookie', auth.createBlankSessionCookie().serialize())
}
