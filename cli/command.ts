// The shape of one command of the engine's command line (`npm run --silent engine -- <command> …`).
export interface OptionSpec {
  name: string
  type: 'string' | 'number' | 'boolean'
  description: string
  default?: string | number | boolean
}

export type OptionValues = Record<string, string | number | boolean | undefined>

/** File access handed to commands, so that they stay testable without a disk. */
export interface EngineIO {
  readFile(path: string): Uint8Array
  writeFile(path: string, bytes: Uint8Array): void
}

export interface EngineCommand {
  name: string
  summary: string
  options: OptionSpec[]
  /** Returns the JSON-serialisable result printed on stdout. */
  run(args: OptionValues, io: EngineIO): Promise<unknown>
}

/** Thrown for a mistake in the command line itself (exit code 2). */
export class UsageError extends Error {
  override readonly name = 'UsageError'
}
