import type { Session, User } from 'lucia'
import type { TokenContext } from './utils/tokens'

declare module 'h3' {
  interface H3EventContext {
    user: User | null
    session: Session | null
    token: TokenContext | null
  }
}

export {}
