import type { CompanionState } from './roles'

/** One entry of a companion's audit trail as the events route gives it. */
export interface CourseEvent {
  id: number
  kind: string
  actor: { name: string, anonymous: boolean, self: boolean }
  fromState: CompanionState | null
  toState: CompanionState | null
  reason: string
  detail: Record<string, string | number | boolean | null>
  revision: string | null
  at: string
}
