// The course of a companion through review: which state may follow which, and who may move it.
// Pure data shared by the server (which enforces it) and the client (which offers the moves).
import type { CompanionRole, CompanionState } from '../types/roles'
import { roleAtLeast } from '../types/roles'

export interface Move {
  from: readonly CompanionState[]
  to: CompanionState
  /** The least role that may make the move (editors may make every move). */
  by: CompanionRole
  /** The button's words. */
  action: string
  /** What the move means, shown beside the button. */
  meaning: string
}

export const MOVES: readonly Move[] = [
  { from: ['draft'], to: 'in_review', by: 'author', action: 'Submit for review', meaning: 'Reviewers are asked to read the companion and remark on it.' },
  { from: ['in_review'], to: 'revising', by: 'editor', action: 'Ask for a revision', meaning: 'The authors answer the remarks and change what needs changing.' },
  { from: ['revising'], to: 'in_review', by: 'author', action: 'Resubmit', meaning: 'The revised companion goes back to the reviewers.' },
  { from: ['in_review', 'revising'], to: 'accepted', by: 'editor', action: 'Accept', meaning: 'The companion is ready; nothing changes until it is published.' },
  { from: ['accepted'], to: 'published', by: 'editor', action: 'Publish', meaning: 'Anyone may read it, download its data and cite it. The current revision is recorded as the published one.' },
  { from: ['accepted'], to: 'revising', by: 'editor', action: 'Reopen for revision', meaning: 'The authors may change it again before it is published.' },
  { from: ['draft', 'in_review', 'revising', 'accepted', 'published'], to: 'withdrawn', by: 'editor', action: 'Withdraw', meaning: 'Nobody but its members sees it any more; nothing is deleted.' },
  { from: ['withdrawn'], to: 'draft', by: 'editor', action: 'Reinstate as a draft', meaning: 'The companion starts its course again.' },
]

/** The moves a role may make from a state. */
export function movesFor(state: CompanionState, role: CompanionRole): Move[] {
  return MOVES.filter(m => m.from.includes(state) && roleAtLeast(role, m.by))
}

/** The move from `from` to `to`, or null when the course has none. */
export function findMove(from: CompanionState, to: CompanionState): Move | null {
  return MOVES.find(m => m.from.includes(from) && m.to === to) ?? null
}

/** States in which authors no longer change data, page or figures (editors still may). */
export const SETTLED_STATES: readonly CompanionState[] = ['accepted', 'published', 'withdrawn']
