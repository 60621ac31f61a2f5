// Revisions of a companion: one git repository per companion (isomorphic-git over Node's fs),
// holding manifest.json (later also page text and figure specs). Every save is a commit on the
// branch `main`; history is linear (each commit has exactly one parent, the opening commit none).
//
// Locking. Every exported function that touches a repository runs inside
// withRepositoryLock(dir, …), writers and readers alike, so a reader never sees a commit that a
// concurrent request is about to take back with resetTo. The lock is re-entrant: a call made
// inside withRepositoryLock for the same directory runs at once instead of waiting for itself,
// so a caller can wrap a whole sequence (read → commit → database transaction → resetTo on
// failure) in one lock and still call the functions below, which lock internally. Inside a held
// lock, run the calls one after another (await each), never in parallel: nested calls are not
// serialised against each other. The lock is per process (one Nitro server); it does not guard
// against a second process writing the same directory. Lock one repository at a time.
//
// Errors are RevisionError with a `code` a handler can map to a status:
//   invalid-oid, invalid-argument, invalid-manifest (bad input, 400),
//   unknown-revision (404), no-repository (404 or 500), not-an-ancestor, corrupt-revision (500).
import fs from 'node:fs'
import path from 'node:path'
import { AsyncLocalStorage } from 'node:async_hooks'
import git from 'isomorphic-git'
import type { CommitObject, TreeEntry } from 'isomorphic-git'
import { z } from 'zod'

export interface ManifestConfiguration {
  index: number
  N: number
  d: number
  checksum: string
  labels: Record<string, unknown>
  bbox?: { min: number[], max: number[] }
  minDistance?: number | null
}

export interface ManifestEnsemble {
  id: number
  name: string
  description?: string
  fileName: string
  format: 'text' | 'json' | 'npy' | 'zip'
  sha256: string
  sizeBytes: number
  objectKey: string
  geometry: unknown
  kernel: unknown
  potential: string | null
  beta: number | null
  convention: unknown
  labels: Record<string, unknown>
  configurations: ManifestConfiguration[]
}

export interface Manifest {
  format: 'quillfield-manifest'
  version: 1
  companion: { slug: string, title: string }
  ensembles: ManifestEnsemble[]
  /** Computations (their definitions; results are found again from the inputs' hash). */
  computations?: Array<{ id: number, name: string, quantity: string, parameters: Record<string, unknown>, ensembleIds: number[] }>
  /** Figures, numbered within the companion. */
  figures?: Array<{ number: number, title: string, caption: string, template: string, computationIds: number[], options: Record<string, unknown> }>
}

export interface RevisionAuthor {
  name: string
  email: string
}

export interface Revision {
  oid: string
  shortOid: string
  /** The whole commit message without its trailing newline. */
  message: string
  author: RevisionAuthor
  /** Author time, ISO 8601 in UTC. */
  timestamp: string
  parents: string[]
}

export type RevisionErrorCode
  = | 'invalid-oid'
    | 'invalid-argument'
    | 'invalid-manifest'
    | 'unknown-revision'
    | 'no-repository'
    | 'not-an-ancestor'
    | 'corrupt-revision'

export class RevisionError extends Error {
  override readonly name = 'RevisionError'
  constructor(message: string, readonly code: RevisionErrorCode, readonly dir?: string) {
    super(message)
  }
}

/** The file that holds the manifest, at the root of every revision's tree. */
export const MANIFEST_FILE = 'manifest.json'
export const MAIN_BRANCH = 'main'
export const OPENING_MESSAGE = 'Companion opened'
const MAIN_REF = `refs/heads/${MAIN_BRANCH}`
const SHORT_OID_LENGTH = 7
const OID_PATTERN = /^[0-9a-f]{40}$/i

// ---------------------------------------------------------------------------------------------
// The per-repository lock

const lockTails = new Map<string, Promise<void>>()
const heldLocks = new AsyncLocalStorage<ReadonlySet<string>>()

/**
 * Runs fn while holding the lock of the repository at dir; calls for one directory run one at a
 * time, in the order they were made. Re-entrant (see the header). A failing fn releases the lock.
 */
export async function withRepositoryLock<T>(dir: string, fn: () => Promise<T> | T): Promise<T> {
  const key = path.resolve(dir)
  const held = heldLocks.getStore()
  if (held?.has(key)) {
    return await fn()
  }
  const previous = lockTails.get(key) ?? Promise.resolve()
  let release: () => void = () => {}
  const current = new Promise<void>((resolve) => {
    release = resolve
  })
  const tail = previous.then(() => current)
  lockTails.set(key, tail)
  await previous
  try {
    return await heldLocks.run(new Set([...(held ?? []), key]), fn)
  }
  finally {
    release()
    if (lockTails.get(key) === tail) {
      lockTails.delete(key)
    }
  }
}

// ---------------------------------------------------------------------------------------------
// Object ids

/** True for a full object id: 40 hexadecimal digits. */
export function isRevisionOid(value: unknown): value is string {
  return typeof value === 'string' && OID_PATTERN.test(value)
}

export function shortOid(oid: string): string {
  return oid.slice(0, SHORT_OID_LENGTH)
}

function requireOid(value: unknown, what: string): string {
  if (!isRevisionOid(value)) {
    const shown = typeof value === 'string' ? `«${value.slice(0, 60)}»` : typeof value
    throw new RevisionError(`${what} must be a full revision id of 40 hexadecimal digits, got ${shown}`, 'invalid-oid')
  }
  return value.toLowerCase()
}

// ---------------------------------------------------------------------------------------------
// Canonical JSON

function isPlainObject(value: unknown): value is Record<string, unknown> {
  if (value === null || typeof value !== 'object' || Array.isArray(value)) {
    return false
  }
  const proto = Object.getPrototypeOf(value) as unknown
  return proto === Object.prototype || proto === null
}

function pathText(parts: ReadonlyArray<string | number>): string {
  let out = ''
  for (const part of parts) {
    if (typeof part === 'number') {
      out += `[${part}]`
    }
    else if (/^[A-Za-z_$][\w$]*$/.test(part)) {
      out += out === '' ? part : `.${part}`
    }
    else {
      out += `[${JSON.stringify(part)}]`
    }
  }
  return out === '' ? 'the manifest' : out
}

// A copy of value with object keys sorted (recursively), refusing what JSON cannot hold exactly.
// Keys whose value is undefined are left out, as JSON.stringify does.
function canonicalValue(value: unknown, at: Array<string | number>, ancestors: Set<object>): unknown {
  if (value === null || typeof value === 'string' || typeof value === 'boolean') {
    return value
  }
  if (typeof value === 'number') {
    if (!Number.isFinite(value)) {
      throw new RevisionError(`manifest value at ${pathText(at)} is ${value}; JSON holds only finite numbers`, 'invalid-manifest')
    }
    return Object.is(value, -0) ? 0 : value
  }
  if (Array.isArray(value)) {
    if (ancestors.has(value)) {
      throw new RevisionError(`manifest value at ${pathText(at)} refers to itself`, 'invalid-manifest')
    }
    ancestors.add(value)
    const out = value.map((item: unknown, i) => {
      if (item === undefined) {
        throw new RevisionError(`manifest value at ${pathText([...at, i])} is undefined; use null`, 'invalid-manifest')
      }
      return canonicalValue(item, [...at, i], ancestors)
    })
    ancestors.delete(value)
    return out
  }
  if (isPlainObject(value)) {
    if (ancestors.has(value)) {
      throw new RevisionError(`manifest value at ${pathText(at)} refers to itself`, 'invalid-manifest')
    }
    ancestors.add(value)
    const out: Record<string, unknown> = {}
    for (const key of Object.keys(value).sort()) {
      if (value[key] !== undefined) {
        out[key] = canonicalValue(value[key], [...at, key], ancestors)
      }
    }
    ancestors.delete(value)
    return out
  }
  throw new RevisionError(`manifest value at ${pathText(at)} is a ${typeof value === 'object' ? 'non-plain object' : typeof value}; only JSON values can be stored`, 'invalid-manifest')
}

/**
 * The stored text of a manifest: keys sorted at every depth (arrays keep their order), two-space
 * indentation, one trailing newline — so equal content gives byte-equal files (common practice
 * for content-addressed storage). Validates the manifest first.
 */
export function canonicalManifestJson(manifest: Manifest): string {
  const value = canonicalValue(manifest, [], new Set())
  validateManifest(value)
  return `${JSON.stringify(value, null, 2)}\n`
}

// ---------------------------------------------------------------------------------------------
// Validation of a manifest

const labelsSchema = z.record(z.string(), z.unknown())
// Free-form JSON that must be present (null when unknown).
const presentSchema = z.unknown().refine(value => value !== undefined, 'is missing (use null when unknown)')
const configurationSchema = z.looseObject({
  index: z.number().int().nonnegative(),
  N: z.number().int().positive(),
  d: z.number().int().positive(),
  checksum: z.string().min(1),
  labels: labelsSchema,
})
const ensembleSchema = z.looseObject({
  id: z.number().int().nonnegative(),
  name: z.string(),
  fileName: z.string(),
  format: z.enum(['text', 'json', 'npy', 'zip']),
  sha256: z.string().regex(/^[0-9a-f]{64}$/, 'expected 64 lowercase hexadecimal digits'),
  sizeBytes: z.number().int().nonnegative(),
  objectKey: z.string(),
  geometry: presentSchema,
  kernel: presentSchema,
  potential: z.string().nullable(),
  beta: z.number().nullable(),
  convention: presentSchema,
  labels: labelsSchema,
  configurations: z.array(configurationSchema),
})
const manifestSchema = z.looseObject({
  format: z.literal('quillfield-manifest'),
  version: z.literal(1),
  companion: z.looseObject({ slug: z.string().min(1), title: z.string() }),
  ensembles: z.array(ensembleSchema),
})

/** Checks the shape of a manifest; throws RevisionError('invalid-manifest') naming the first problems. */
export function validateManifest(value: unknown, source = 'manifest'): Manifest {
  const parsed = manifestSchema.safeParse(value)
  if (!parsed.success) {
    const problems = parsed.error.issues.slice(0, 5).map(issue =>
      `${pathText(issue.path.filter((p): p is string | number => typeof p !== 'symbol'))}: ${issue.message}`)
    const more = parsed.error.issues.length > 5 ? ` (and ${parsed.error.issues.length - 5} more)` : ''
    throw new RevisionError(`${source} is not valid: ${problems.join('; ')}${more}`, 'invalid-manifest')
  }
  const manifest = value as Manifest
  const ids = new Set<number>()
  manifest.ensembles.forEach((ensemble, e) => {
    if (ids.has(ensemble.id)) {
      throw new RevisionError(`${source} is not valid: ensembles[${e}] repeats ensemble id ${ensemble.id}`, 'invalid-manifest')
    }
    ids.add(ensemble.id)
    const indices = new Set<number>()
    ensemble.configurations.forEach((configuration, c) => {
      if (indices.has(configuration.index)) {
        throw new RevisionError(`${source} is not valid: ensembles[${e}].configurations[${c}] repeats configuration index ${configuration.index}`, 'invalid-manifest')
      }
      indices.add(configuration.index)
    })
  })
  return manifest
}

// ---------------------------------------------------------------------------------------------
// Repository plumbing (all callers hold the lock)

function requireAuthor(author: RevisionAuthor | undefined): RevisionAuthor {
  if (!author || typeof author.name !== 'string' || typeof author.email !== 'string') {
    throw new RevisionError('a revision needs an author with a name and an e-mail address', 'invalid-argument')
  }
  const name = author.name.trim()
  const email = author.email.trim()
  if (name === '' || email === '') {
    throw new RevisionError('the author of a revision needs a non-empty name and e-mail address', 'invalid-argument')
  }
  for (const [what, text] of [['name', name], ['e-mail address', email]] as const) {
    if (/[<>\n\r\0]/.test(text)) {
      throw new RevisionError(`the author's ${what} may not contain <, > or line breaks`, 'invalid-argument')
    }
  }
  return { name, email }
}

function requireMessage(message: string | undefined): string {
  const text = typeof message === 'string' ? message.replace(/\r\n?/g, '\n').trim() : ''
  if (text === '') {
    throw new RevisionError('a revision needs a non-empty message', 'invalid-argument')
  }
  if (text.includes('\0')) {
    throw new RevisionError('a revision message may not contain NUL characters', 'invalid-argument')
  }
  return text
}

function signature(author: RevisionAuthor, date: Date | undefined) {
  if (date !== undefined && !Number.isFinite(date.getTime())) {
    throw new RevisionError('the date of a revision is not a valid date', 'invalid-argument')
  }
  const timestamp = Math.floor((date ?? new Date()).getTime() / 1000)
  return { ...author, timestamp, timezoneOffset: 0 }
}

function isGitError(error: unknown, code: string): boolean {
  return error instanceof Error && (error as Error & { code?: unknown }).code === code
}

async function requireRepository(dir: string): Promise<void> {
  try {
    await fs.promises.access(path.join(dir, '.git', 'HEAD'))
  }
  catch {
    throw new RevisionError('this companion has no revision repository yet', 'no-repository', dir)
  }
}

/** The commit main points at, or null in a repository without commits. */
async function mainHead(dir: string): Promise<string | null> {
  try {
    return await git.resolveRef({ fs, dir, ref: MAIN_REF })
  }
  catch (error) {
    if (isGitError(error, 'NotFoundError')) {
      return null
    }
    throw error
  }
}

async function requireHead(dir: string): Promise<string> {
  await requireRepository(dir)
  const head = await mainHead(dir)
  if (head === null) {
    throw new RevisionError('this companion\'s repository has no revisions yet', 'no-repository', dir)
  }
  return head
}

async function readCommitOrNull(dir: string, oid: string): Promise<CommitObject | null> {
  try {
    return (await git.readCommit({ fs, dir, oid })).commit
  }
  catch (error) {
    if (isGitError(error, 'NotFoundError') || isGitError(error, 'ObjectTypeError')) {
      return null
    }
    throw error
  }
}

/** The commit of oid, which must lie on main's history (the head or one of its ancestors). */
async function requireRevision(dir: string, oid: string, head: string): Promise<CommitObject> {
  const unknown = () => new RevisionError(`no revision ${oid} in this companion`, 'unknown-revision', dir)
  const commit = await readCommitOrNull(dir, oid)
  if (commit === null) {
    throw unknown()
  }
  if (oid !== head && !(await git.isDescendent({ fs, dir, oid: head, ancestor: oid, depth: -1 }))) {
    throw unknown()
  }
  return commit
}

async function resolveRevision(dir: string, ref: string): Promise<{ oid: string, commit: CommitObject }> {
  const head = await requireHead(dir)
  const oid = ref === 'HEAD' ? head : requireOid(ref, 'the revision')
  return { oid, commit: await requireRevision(dir, oid, head) }
}

async function manifestOfCommit(dir: string, oid: string): Promise<Manifest> {
  let bytes: Uint8Array
  try {
    bytes = (await git.readBlob({ fs, dir, oid, filepath: MANIFEST_FILE })).blob
  }
  catch (error) {
    if (isGitError(error, 'NotFoundError')) {
      throw new RevisionError(`revision ${shortOid(oid)} has no ${MANIFEST_FILE}`, 'corrupt-revision', dir)
    }
    throw error
  }
  let value: unknown
  try {
    value = JSON.parse(new TextDecoder().decode(bytes))
  }
  catch (error) {
    throw new RevisionError(`${MANIFEST_FILE} of revision ${shortOid(oid)} is not valid JSON: ${(error as Error).message}`, 'corrupt-revision', dir)
  }
  try {
    return validateManifest(value, `${MANIFEST_FILE} of revision ${shortOid(oid)}`)
  }
  catch (error) {
    if (error instanceof RevisionError) {
      throw new RevisionError(error.message, 'corrupt-revision', dir)
    }
    throw error
  }
}

// Brings the work tree and index in line with main (files of humans looking at the repository;
// nothing here reads the work tree).
async function syncWorkTree(dir: string): Promise<void> {
  await git.checkout({ fs, dir, ref: MAIN_BRANCH, force: true })
}

async function writeManifestCommit(
  dir: string,
  manifest: Manifest,
  parent: string | null,
  author: RevisionAuthor,
  message: string,
  date: Date | undefined,
  files: Record<string, string> = {},
): Promise<{ oid: string, changed: boolean }> {
  const text = canonicalManifestJson(manifest)
  const blob = await git.writeBlob({ fs, dir, blob: new TextEncoder().encode(text) })
  const written = [{ path: MANIFEST_FILE, oid: blob }]
  for (const [name, content] of Object.entries(files)) {
    if (name === MANIFEST_FILE || !/^[\w.-]+$/.test(name) || name.startsWith('.')) {
      throw new RevisionError(`«${name}» cannot be stored beside the manifest`, 'invalid-argument')
    }
    written.push({ path: name, oid: await git.writeBlob({ fs, dir, blob: new TextEncoder().encode(content) }) })
  }
  let entries: TreeEntry[] = []
  if (parent !== null) {
    const tree = (await git.readTree({ fs, dir, oid: parent })).tree
    if (written.every(w => tree.some(entry => entry.path === w.path && entry.oid === w.oid))) {
      return { oid: parent, changed: false }
    }
    entries = tree.filter(entry => !written.some(w => w.path === entry.path))
  }
  for (const w of written) entries.push({ mode: '100644', path: w.path, oid: w.oid, type: 'blob' })
  const tree = await git.writeTree({ fs, dir, tree: entries })
  const oid = await git.commit({
    fs,
    dir,
    ref: MAIN_REF,
    tree,
    parent: parent === null ? [] : [parent],
    message,
    author: signature(author, date),
  })
  await syncWorkTree(dir)
  return { oid, changed: true }
}

function firstLine(message: string): string {
  return message.split('\n', 1)[0]?.trim() ?? ''
}

function toRevision(oid: string, commit: CommitObject): Revision {
  return {
    oid,
    shortOid: shortOid(oid),
    message: commit.message.replace(/\n+$/, ''),
    author: { name: commit.author.name, email: commit.author.email },
    timestamp: new Date(commit.author.timestamp * 1000).toISOString(),
    parents: [...commit.parent],
  }
}

// ---------------------------------------------------------------------------------------------
// The operations

export interface OpenRepositoryOptions {
  author: RevisionAuthor
  /** Slug and title written into the opening manifest (which has no ensembles). */
  companion: { slug: string, title: string }
  date?: Date
}

/**
 * Makes sure dir holds a git repository with default branch main and at least one revision.
 * A missing repository is created; an empty one gets the opening commit «Companion opened» by
 * the given author, holding a manifest without ensembles. An existing history is left alone.
 */
export async function openRepository(dir: string, options: OpenRepositoryOptions): Promise<{ oid: string, created: boolean }> {
  const author = requireAuthor(options?.author)
  return await withRepositoryLock(dir, async () => {
    if (!fs.existsSync(path.join(dir, '.git', 'HEAD'))) {
      await fs.promises.mkdir(dir, { recursive: true })
      await git.init({ fs, dir, defaultBranch: MAIN_BRANCH })
    }
    const head = await mainHead(dir)
    if (head !== null) {
      return { oid: head, created: false }
    }
    const manifest: Manifest = {
      format: 'quillfield-manifest',
      version: 1,
      companion: { slug: options.companion?.slug, title: options.companion?.title },
      ensembles: [],
    }
    const { oid } = await writeManifestCommit(dir, manifest, null, author, OPENING_MESSAGE, options.date)
    return { oid, created: true }
  })
}

/** The commit main points at. */
export async function headOid(dir: string): Promise<string> {
  return await withRepositoryLock(dir, () => requireHead(dir))
}

/** The manifest stored in a revision ('HEAD' or a full oid on main's history), read from the commit's tree. */
export async function readManifest(dir: string, ref = 'HEAD'): Promise<Manifest> {
  return await withRepositoryLock(dir, async () => {
    const { oid } = await resolveRevision(dir, ref)
    return await manifestOfCommit(dir, oid)
  })
}

export interface CommitOptions {
  author: RevisionAuthor
  message: string
  /** Author time; now when left out (fixed dates give reproducible oids, e.g. in a demo seed). */
  date?: Date
  /** Other text files written beside the manifest in the same commit (e.g. page.md), by name. */
  files?: Record<string, string>
}

/**
 * Writes manifest.json canonically (see canonicalManifestJson) and commits it on main; other
 * files of the tree are kept. When the canonical text equals the head's, nothing is committed
 * and the head oid comes back with changed: false.
 */
export async function commitManifest(dir: string, manifest: Manifest, options: CommitOptions): Promise<{ oid: string, changed: boolean }> {
  const author = requireAuthor(options?.author)
  const message = requireMessage(options?.message)
  canonicalManifestJson(manifest)
  return await withRepositoryLock(dir, async () => {
    const head = await requireHead(dir)
    return await writeManifestCommit(dir, manifest, head, author, message, options.date, options.files)
  })
}

/** The text of a file beside the manifest in a revision ('HEAD' or a full oid), or null when it has none. */
export async function readRevisionFile(dir: string, ref: string, filepath: string): Promise<string | null> {
  return await withRepositoryLock(dir, async () => {
    const { oid } = await resolveRevision(dir, ref)
    try {
      return new TextDecoder().decode((await git.readBlob({ fs, dir, oid, filepath })).blob)
    }
    catch (error) {
      if (isGitError(error, 'NotFoundError')) return null
      throw error
    }
  })
}

/** Changes a manifest in place, or returns the new one. */
export type ManifestUpdate
  = | ((manifest: Manifest) => Manifest | Promise<Manifest>)
    | ((manifest: Manifest) => Promise<void>)
    | ((manifest: Manifest) => void)

/**
 * Read, change and commit the manifest in one hold of the lock, so concurrent updates of one
 * companion each see the previous one's result. update may change its argument or return a new manifest.
 */
export async function updateManifest(
  dir: string,
  update: ManifestUpdate,
  options: CommitOptions,
): Promise<{ oid: string, changed: boolean, manifest: Manifest }> {
  const author = requireAuthor(options?.author)
  const message = requireMessage(options?.message)
  return await withRepositoryLock(dir, async () => {
    const head = await requireHead(dir)
    const current = await manifestOfCommit(dir, head)
    const returned: unknown = await update(current)
    const next = returned === undefined ? current : returned as Manifest
    const result = await writeManifestCommit(dir, next, head, author, message, options.date)
    return { ...result, manifest: await manifestOfCommit(dir, result.oid) }
  })
}

/** Revisions on main, newest first (following first parents from the head). */
export async function listRevisions(dir: string, options: { limit?: number } = {}): Promise<Revision[]> {
  const limit = options.limit
  if (limit !== undefined && (!Number.isInteger(limit) || limit < 1)) {
    throw new RevisionError(`the number of revisions to list must be a positive whole number, got ${limit}`, 'invalid-argument')
  }
  return await withRepositoryLock(dir, async () => {
    const out: Revision[] = []
    let oid: string | undefined = await requireHead(dir)
    while (oid !== undefined && (limit === undefined || out.length < limit)) {
      const commit = await readCommitOrNull(dir, oid)
      if (commit === null) {
        throw new RevisionError(`revision ${oid} is missing from the repository`, 'corrupt-revision', dir)
      }
      out.push(toRevision(oid, commit))
      oid = commit.parent[0]
    }
    return out
  })
}

/** One revision by oid. */
export async function readRevision(dir: string, oid: string): Promise<Revision> {
  const id = requireOid(oid, 'the revision')
  return await withRepositoryLock(dir, async () => {
    const { commit } = await resolveRevision(dir, id)
    return toRevision(id, commit)
  })
}

export interface RevisionDiff extends ManifestDiff {
  from: Revision
  to: Revision
}

/** The structural difference between the manifests of two revisions (see diffManifests). */
export async function diffRevisions(dir: string, fromOid: string, toOid: string): Promise<RevisionDiff> {
  const fromId = requireOid(fromOid, 'the earlier revision')
  const toId = requireOid(toOid, 'the later revision')
  return await withRepositoryLock(dir, async () => {
    const from = await resolveRevision(dir, fromId)
    const to = await resolveRevision(dir, toId)
    const diff = diffManifests(await manifestOfCommit(dir, fromId), await manifestOfCommit(dir, toId))
    return { from: toRevision(fromId, from.commit), to: toRevision(toId, to.commit), ...diff }
  })
}

/**
 * Makes the content of an earlier revision current again: a new commit on top of the head whose
 * tree is the old revision's whole tree (manifest and any other files), with the message
 * «Restored revision <short oid>: <first line of its message>». History is kept. When the head
 * already has that content nothing is committed (changed: false). The caller brings the database
 * in line with the returned manifest.
 */
export async function restoreRevision(
  dir: string,
  oid: string,
  options: { author: RevisionAuthor, date?: Date },
): Promise<{ oid: string, manifest: Manifest, changed: boolean }> {
  const id = requireOid(oid, 'the revision to restore')
  const author = requireAuthor(options?.author)
  return await withRepositoryLock(dir, async () => {
    const head = await requireHead(dir)
    const old = await requireRevision(dir, id, head)
    const manifest = await manifestOfCommit(dir, id)
    const headCommit = await readCommitOrNull(dir, head)
    if (headCommit?.tree === old.tree) {
      return { oid: head, manifest, changed: false }
    }
    const newOid = await git.commit({
      fs,
      dir,
      ref: MAIN_REF,
      tree: old.tree,
      parent: [head],
      message: `Restored revision ${shortOid(id)}: ${firstLine(old.message)}`,
      author: signature(author, options.date),
    })
    await syncWorkTree(dir)
    return { oid: newOid, manifest, changed: true }
  })
}

/**
 * Moves main back to oid (the head or one of its ancestors), dropping the later commits from the
 * history; the work tree follows. Meant for undoing a commit whose database transaction failed:
 *
 *   await withRepositoryLock(dir, async () => {
 *     const before = await headOid(dir)
 *     await commitManifest(dir, manifest, { author, message })
 *     try { await db.transaction(...) }
 *     catch (error) { await resetTo(dir, before); throw error }
 *   })
 *
 * Holding the lock around the whole sequence keeps other requests from building on, or even
 * seeing, the commit that may be undone. Moving main forward or sideways is refused (not-an-ancestor).
 */
export async function resetTo(dir: string, oid: string): Promise<{ oid: string, previous: string }> {
  const id = requireOid(oid, 'the revision to reset to')
  return await withRepositoryLock(dir, async () => {
    const head = await requireHead(dir)
    if (id === head) {
      return { oid: id, previous: head }
    }
    if ((await readCommitOrNull(dir, id)) === null) {
      throw new RevisionError(`no revision ${id} in this companion`, 'unknown-revision', dir)
    }
    if (!(await git.isDescendent({ fs, dir, oid: head, ancestor: id, depth: -1 }))) {
      throw new RevisionError(`revision ${id} is not an earlier revision of this companion; main can only be moved back`, 'not-an-ancestor', dir)
    }
    await git.writeRef({ fs, dir, ref: MAIN_REF, value: id, force: true })
    await syncWorkTree(dir)
    return { oid: id, previous: head }
  })
}

// ---------------------------------------------------------------------------------------------
// Structural difference of two manifests

export interface FieldChange {
  /** The ensemble (or companion, or configuration) field: 'name', 'beta', 'convention', 'labels', … */
  field: string
  /** Dotted key inside the field for convention, geometry, kernel and labels; '' for the whole field. */
  key: string
  kind: 'added' | 'removed' | 'changed'
  from?: unknown
  to?: unknown
}

export interface ConfigurationsDiff {
  added: number[]
  removed: number[]
  changed: Array<{ index: number, changes: FieldChange[] }>
}

export interface EnsembleChange {
  id: number
  /** The name in the later manifest. */
  name: string
  fields: FieldChange[]
  configurations: ConfigurationsDiff
}

export interface ManifestDiff {
  identical: boolean
  companion: FieldChange[]
  added: ManifestEnsemble[]
  removed: ManifestEnsemble[]
  changed: EnsembleChange[]
  /** The same in plain words, one change a line (empty when identical). */
  lines: string[]
}

const ENSEMBLE_FIELD_ORDER = [
  'name', 'fileName', 'format', 'sha256', 'sizeBytes', 'objectKey',
  'potential', 'beta', 'geometry', 'kernel', 'convention', 'labels',
]
// Fields compared key by key when both sides are objects.
const DEEP_FIELDS = new Set(['geometry', 'kernel', 'convention', 'labels'])
const FIELD_WORDS: Record<string, string> = {
  name: 'name',
  fileName: 'file name',
  format: 'file format',
  sha256: 'file checksum (SHA-256)',
  sizeBytes: 'file size',
  objectKey: 'storage key',
  potential: 'potential',
  beta: 'β',
  geometry: 'geometry',
  kernel: 'kernel',
  convention: 'convention',
  labels: 'label',
  checksum: 'checksum',
  slug: 'slug',
  title: 'title',
}

function canonicalText(value: unknown): string {
  return JSON.stringify(canonicalValue(value, [], new Set())) ?? 'undefined'
}

function sameValue(a: unknown, b: unknown): boolean {
  return canonicalText(a) === canonicalText(b)
}

function deepChanges(field: string, a: unknown, b: unknown, keys: string[], out: FieldChange[]): void {
  if (isPlainObject(a) && isPlainObject(b)) {
    const all = [...new Set([...Object.keys(a), ...Object.keys(b)])].sort()
    for (const k of all) {
      const inA = a[k] !== undefined
      const inB = b[k] !== undefined
      if (inA && !inB) {
        out.push({ field, key: [...keys, k].join('.'), kind: 'removed', from: a[k] })
      }
      else if (!inA && inB) {
        out.push({ field, key: [...keys, k].join('.'), kind: 'added', to: b[k] })
      }
      else if (inA && inB) {
        deepChanges(field, a[k], b[k], [...keys, k], out)
      }
    }
  }
  else if (!sameValue(a, b)) {
    out.push({ field, key: keys.join('.'), kind: 'changed', from: a, to: b })
  }
}

function fieldChanges(a: Record<string, unknown>, b: Record<string, unknown>, order: string[], deep: Set<string>, skip: Set<string>): FieldChange[] {
  const extra = [...new Set([...Object.keys(a), ...Object.keys(b)])]
    .filter(k => !order.includes(k) && !skip.has(k))
    .sort()
  const out: FieldChange[] = []
  for (const field of [...order, ...extra]) {
    const inA = a[field] !== undefined
    const inB = b[field] !== undefined
    if (inA && !inB) {
      out.push({ field, key: '', kind: 'removed', from: a[field] })
    }
    else if (!inA && inB) {
      out.push({ field, key: '', kind: 'added', to: b[field] })
    }
    else if (inA && inB) {
      if (deep.has(field) || !order.includes(field)) {
        deepChanges(field, a[field], b[field], [], out)
      }
      else if (!sameValue(a[field], b[field])) {
        out.push({ field, key: '', kind: 'changed', from: a[field], to: b[field] })
      }
    }
  }
  return out
}

function diffConfigurations(a: ManifestConfiguration[], b: ManifestConfiguration[]): ConfigurationsDiff {
  const before = new Map(a.map(c => [c.index, c]))
  const after = new Map(b.map(c => [c.index, c]))
  const out: ConfigurationsDiff = { added: [], removed: [], changed: [] }
  for (const index of [...new Set([...before.keys(), ...after.keys()])].sort((x, y) => x - y)) {
    const x = before.get(index)
    const y = after.get(index)
    if (x === undefined) {
      out.added.push(index)
    }
    else if (y === undefined) {
      out.removed.push(index)
    }
    else {
      const changes = fieldChanges(
        x as unknown as Record<string, unknown>,
        y as unknown as Record<string, unknown>,
        ['checksum', 'N', 'd', 'labels'],
        new Set(['labels']),
        new Set(['index']),
      )
      if (changes.length > 0) {
        out.changed.push({ index, changes })
      }
    }
  }
  return out
}

/** The structural difference between two manifests; ensembles are matched by id, configurations by index. */
export function diffManifests(from: Manifest, to: Manifest): ManifestDiff {
  const companion = [
    ...fieldChanges(from.companion, to.companion, ['slug', 'title'], new Set(), new Set()),
    ...fieldChanges(
      from as unknown as Record<string, unknown>,
      to as unknown as Record<string, unknown>,
      [],
      new Set(),
      new Set(['format', 'version', 'companion', 'ensembles']),
    ),
  ]
  const before = new Map(from.ensembles.map(e => [e.id, e]))
  const after = new Map(to.ensembles.map(e => [e.id, e]))
  const added: ManifestEnsemble[] = []
  const removed: ManifestEnsemble[] = []
  const changed: EnsembleChange[] = []
  const lines = companion.map(change => `Companion ${describeChange(change)}`)
  for (const id of [...new Set([...before.keys(), ...after.keys()])].sort((x, y) => x - y)) {
    const a = before.get(id)
    const b = after.get(id)
    if (a === undefined && b !== undefined) {
      added.push(b)
      lines.push(`${ensembleTitle(b)} added (${ensembleSummary(b)})`)
    }
    else if (b === undefined && a !== undefined) {
      removed.push(a)
      lines.push(`${ensembleTitle(a)} removed (${ensembleSummary(a)})`)
    }
    else if (a !== undefined && b !== undefined) {
      const fields = fieldChanges(
        a as unknown as Record<string, unknown>,
        b as unknown as Record<string, unknown>,
        ENSEMBLE_FIELD_ORDER,
        DEEP_FIELDS,
        new Set(['id', 'configurations']),
      )
      const configurations = diffConfigurations(a.configurations, b.configurations)
      const count = configurations.added.length + configurations.removed.length + configurations.changed.length
      if (fields.length > 0 || count > 0) {
        changed.push({ id, name: b.name, fields, configurations })
        const title = ensembleTitle(b)
        for (const change of fields) {
          lines.push(`${title}: ${describeChange(change)}`)
        }
        for (const line of describeConfigurations(configurations)) {
          lines.push(`${title}: ${line}`)
        }
      }
    }
  }
  const identical = lines.length === 0
  return { identical, companion, added, removed, changed, lines }
}

function ensembleTitle(e: ManifestEnsemble): string {
  return `Ensemble ${e.id} «${e.name}»`
}

function ensembleSummary(e: ManifestEnsemble): string {
  const n = e.configurations.length
  return `${n} configuration${n === 1 ? '' : 's'} from ${e.fileName}`
}

function valueWords(value: unknown, field: string): string {
  if (value === null) {
    return 'none'
  }
  if (typeof value === 'string') {
    if (field === 'name' || field === 'title') {
      return `«${value}»`
    }
    if (field === 'sha256' || field === 'checksum') {
      return value.length > 16 ? `${value.slice(0, 12)}…` : value
    }
    return value === '' ? '(empty)' : value
  }
  if (typeof value === 'number' && field === 'sizeBytes') {
    return `${value} bytes`
  }
  if (typeof value === 'number' || typeof value === 'boolean') {
    return String(value)
  }
  return canonicalText(value)
}

function describeChange(change: FieldChange): string {
  const words = FIELD_WORDS[change.field] ?? change.field
  const subject = change.key === '' ? words : `${words} ${change.key}`
  if (change.kind === 'added') {
    return `${subject} set to ${valueWords(change.to, change.field)}`
  }
  if (change.kind === 'removed') {
    return `${subject} removed (was ${valueWords(change.from, change.field)})`
  }
  return `${subject} changed from ${valueWords(change.from, change.field)} to ${valueWords(change.to, change.field)}`
}

/** Sorted whole numbers as «0–3, 7, 9, 10»: runs of three or more become a range. */
export function indexRanges(indices: number[]): string {
  const sorted = [...new Set(indices)].sort((x, y) => x - y)
  const parts: string[] = []
  let i = 0
  while (i < sorted.length) {
    let j = i
    while (j + 1 < sorted.length && sorted[j + 1] === sorted[j]! + 1) {
      j++
    }
    if (j - i >= 2) {
      parts.push(`${sorted[i]}–${sorted[j]}`)
    }
    else {
      for (let k = i; k <= j; k++) {
        parts.push(String(sorted[k]))
      }
    }
    i = j + 1
  }
  return parts.join(', ')
}

function configurationsWord(indices: number[]): string {
  return `configuration${indices.length === 1 ? '' : 's'} ${indexRanges(indices)}`
}

function describeConfigurations(diff: ConfigurationsDiff): string[] {
  const lines: string[] = []
  if (diff.added.length > 0) {
    lines.push(`${configurationsWord(diff.added)} added`)
  }
  if (diff.removed.length > 0) {
    lines.push(`${configurationsWord(diff.removed)} removed`)
  }
  const checksums = diff.changed.filter(c => c.changes.some(change => change.field === 'checksum'))
  if (checksums.length === 1) {
    const only = checksums[0]!
    const change = only.changes.find(c => c.field === 'checksum')!
    lines.push(`configuration ${only.index} ${describeChange(change)}`)
  }
  else if (checksums.length > 1) {
    lines.push(`checksum changed for ${configurationsWord(checksums.map(c => c.index))}`)
  }
  // Other changes, grouped when several configurations changed the same way.
  const groups = new Map<string, number[]>()
  for (const { index, changes } of diff.changed) {
    for (const change of changes) {
      if (change.field !== 'checksum') {
        const words = describeChange(change)
        groups.set(words, [...(groups.get(words) ?? []), index])
      }
    }
  }
  for (const [words, indices] of groups) {
    lines.push(`${configurationsWord(indices)}: ${words}`)
  }
  return lines
}
