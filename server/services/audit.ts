// The audit trail of a companion (table companion_event): who did what, when, and why.
import type { CompanionState } from '#shared/types/roles'

type Executor = Pick<ReturnType<typeof useDB>, 'insert'>

export interface AuditEntry {
  companionId: number
  actorId: string | null
  /** What happened: 'state', 'invitation', 'invitation-accepted', 'member', 'page', 'remark', 'identities', 'remarks-public', 'license', … */
  kind: string
  reason?: string
  fromState?: CompanionState | null
  toState?: CompanionState | null
  detail?: Record<string, string | number | boolean | null>
  revision?: string | null
}

/** Appends one entry; pass the transaction when the change it records is made in one. */
export async function recordEvent(entry: AuditEntry, executor: Executor = useDB()): Promise<void> {
  await executor.insert(tables.companionEvents).values({
    companionId: entry.companionId,
    actorId: entry.actorId,
    kind: entry.kind,
    reason: entry.reason ?? '',
    fromState: entry.fromState ?? null,
    toState: entry.toState ?? null,
    detail: entry.detail ?? {},
    revision: entry.revision ?? null,
  })
}
