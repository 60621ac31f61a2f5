// Error locations for file input: "file, line L, column C" prefixes and the one error class.
// Lines and columns are 1-based, columns count UTF-16 code units (common practice for text editors).
import { EngineInputError, type InputLocation } from '../errors'

/** Human-readable location, e.g. "points.csv, line 12, column 5" (empty when nothing is known). */
export function describeLocation(where: InputLocation): string {
  const parts: string[] = []
  if (where.file !== undefined) parts.push(where.file)
  if (where.line !== undefined) parts.push(`line ${where.line}`)
  if (where.column !== undefined) parts.push(`column ${where.column}`)
  return parts.join(', ')
}

/** An EngineInputError whose message starts with the file location, when one is known. */
export function inputError(message: string, where: InputLocation): EngineInputError {
  const prefix = describeLocation(where)
  return new EngineInputError(prefix ? `${prefix}: ${message}` : message, where)
}

/** Shortens a piece of input for quoting in a message. */
export function quote(text: string, max = 40): string {
  const cut = text.length > max ? `${text.slice(0, max)}…` : text
  return JSON.stringify(cut)
}
