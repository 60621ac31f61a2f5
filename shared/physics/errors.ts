// The one error class of the engine for bad input: it says what is wrong and where.
export interface InputLocation {
  file?: string
  line?: number
  column?: number
  /** Index of the point (0-based) the error concerns. */
  index?: number
  /** Several point indices, e.g. two coincident points. */
  indices?: number[]
  /** Index of the configuration within an ensemble (0-based). */
  configuration?: number
}

export class EngineInputError extends Error {
  override readonly name = 'EngineInputError'
  constructor(message: string, readonly where: InputLocation = {}) {
    super(message)
  }
}
