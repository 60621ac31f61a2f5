// The line under a figure plate: convention, engine version and status in words.
import type { FigureStatus, ResultTable } from './types'

const statusPhrase: Record<FigureStatus['word'], string> = {
  current: 'current',
  queued: 'queued',
  drifted: 'drifted',
  failed: 'failed',
}

export function captionLine(table: Pick<ResultTable, 'convention' | 'engineVersion'> | Array<Pick<ResultTable, 'convention' | 'engineVersion'>>, status: FigureStatus): string {
  const tables = Array.isArray(table) ? table : [table]
  const conventions = [...new Set(tables.map(t => t.convention))].join('; ') || 'not stated'
  const engines = [...new Set(tables.map(t => t.engineVersion))].join(', ') || 'unknown'
  const word = statusPhrase[status.word] ?? status.word
  const detail = status.detail ? ` (${status.detail})` : ''
  return `Convention: ${conventions} · engine ${engines} · status: ${word}${detail}`
}
