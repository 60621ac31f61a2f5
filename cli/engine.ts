// The engine's command line: `npm run --silent engine -- <command> [options]`.
// Prints one JSON document on stdout; errors go to stderr with a non-zero exit code
// (1 for bad input or a failed computation, 2 for a mistake in the command line).
import { readFileSync, writeFileSync } from 'node:fs'
import { EngineInputError } from '../shared/physics/errors'
import { ENGINE_VERSION } from '../shared/physics/version'
import type { EngineCommand, EngineIO, OptionSpec, OptionValues } from './command'
import { UsageError } from './command'
import { commands } from './commands'

export function parseArguments(argv: string[], options: OptionSpec[]): OptionValues {
  const byName = new Map(options.map(o => [o.name, o]))
  const values: OptionValues = {}
  for (let i = 0; i < argv.length; i++) {
    const token = argv[i]!
    if (!token.startsWith('--')) throw new UsageError(`unexpected argument "${token}" (options start with --)`)
    const eq = token.indexOf('=')
    const name = token.slice(2, eq < 0 ? undefined : eq)
    const spec = byName.get(name)
    if (!spec) throw new UsageError(`unknown option --${name}`)
    let raw: string | undefined = eq < 0 ? undefined : token.slice(eq + 1)
    if (spec.type === 'boolean') {
      values[name] = raw === undefined ? true : !['false', '0', 'no'].includes(raw)
      continue
    }
    if (raw === undefined) {
      raw = argv[++i]
      if (raw === undefined) throw new UsageError(`--${name} needs a value`)
    }
    if (spec.type === 'number') {
      const n = Number(raw)
      if (!Number.isFinite(n)) throw new UsageError(`--${name} needs a number (got "${raw}")`)
      values[name] = n
    }
    else values[name] = raw
  }
  for (const spec of options) {
    if (values[spec.name] === undefined && spec.default !== undefined) values[spec.name] = spec.default
  }
  return values
}

export function helpText(command?: EngineCommand): string {
  if (!command) {
    const width = Math.max(...commands.map(c => c.name.length))
    return [
      `Quillfield engine ${ENGINE_VERSION} — energies and statistics of point configurations`,
      '',
      'usage: npm run --silent engine -- <command> [options]',
      '       npm run --silent engine -- <command> --help',
      '',
      'commands:',
      ...commands.map(c => `  ${c.name.padEnd(width)}  ${c.summary}`),
      '',
      'Results are JSON on stdout and name their convention and the engine version.',
    ].join('\n')
  }
  const width = Math.max(...command.options.map(o => o.name.length + (o.type === 'boolean' ? 0 : o.type.length + 3)))
  return [
    `usage: npm run --silent engine -- ${command.name} [options]`,
    '',
    command.summary,
    '',
    'options:',
    ...command.options.map((o) => {
      const left = o.type === 'boolean' ? `--${o.name}` : `--${o.name} <${o.type}>`
      return `  ${left.padEnd(width + 2)}  ${o.description}${o.default !== undefined ? ` (default ${o.default})` : ''}`
    }),
  ].join('\n')
}

/** Typed arrays print as arrays; non-finite numbers as strings (JSON has none). */
function replacer(_key: string, value: unknown): unknown {
  if (value instanceof Float64Array || value instanceof Float32Array || value instanceof Int32Array) return Array.from(value)
  if (typeof value === 'number' && !Number.isFinite(value)) return String(value)
  return value
}

export interface RunResult {
  code: number
  stdout: string
  stderr: string
}

export async function runEngine(argv: string[], io: EngineIO): Promise<RunResult> {
  const [name, ...rest] = argv
  if (!name || name === '--help' || name === 'help') {
    const target = name === 'help' ? commands.find(c => c.name === rest[0]) : undefined
    return { code: 0, stdout: `${helpText(target)}\n`, stderr: '' }
  }
  const command = commands.find(c => c.name === name)
  if (!command) return { code: 2, stdout: '', stderr: `unknown command "${name}"\n\n${helpText()}\n` }
  if (rest.includes('--help')) return { code: 0, stdout: `${helpText(command)}\n`, stderr: '' }
  try {
    const args = parseArguments(rest, command.options)
    const result = await command.run(args, io)
    return { code: 0, stdout: `${JSON.stringify(result, replacer, 2)}\n`, stderr: '' }
  }
  catch (error) {
    if (error instanceof UsageError) return { code: 2, stdout: '', stderr: `error: ${error.message}\n(see: npm run --silent engine -- ${command.name} --help)\n` }
    if (error instanceof EngineInputError) {
      const where = Object.keys(error.where).length ? `\nwhere: ${JSON.stringify(error.where)}` : ''
      return { code: 1, stdout: '', stderr: `error: ${error.message}${where}\n` }
    }
    const message = error instanceof Error ? error.message : String(error)
    return { code: 1, stdout: '', stderr: `error: ${message}\n` }
  }
}

export const nodeIO: EngineIO = {
  readFile(path) {
    try {
      return new Uint8Array(readFileSync(path))
    }
    catch (error) {
      const code = (error as { code?: string }).code
      throw new EngineInputError(code === 'ENOENT' ? `${path}: no such file` : `${path}: cannot be read (${code ?? 'error'})`, { file: path })
    }
  },
  writeFile(path, bytes) {
    writeFileSync(path, bytes)
  },
}

const invokedDirectly = process.argv[1] !== undefined && /cli[\\/]engine\.ts$/.test(process.argv[1])
if (invokedDirectly) {
  const result = await runEngine(process.argv.slice(2), nodeIO)
  process.stdout.write(result.stdout)
  process.stderr.write(result.stderr)
  process.exitCode = result.code
}
