import { execFileSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import git from 'isomorphic-git'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import {
  RevisionError,
  canonicalManifestJson,
  commitManifest,
  diffManifests,
  diffRevisions,
  headOid,
  indexRanges,
  listRevisions,
  openRepository,
  readManifest,
  readRevision,
  resetTo,
  restoreRevision,
  updateManifest,
  withRepositoryLock,
} from '../../server/utils/revisions'
import type { Manifest, ManifestConfiguration, ManifestEnsemble } from '../../server/utils/revisions'

const ann = { name: 'Ann Harbour', email: 'ann@harbour-lane.example' }
const ben = { name: 'Ben Lane', email: 'ben@harbour-lane.example' }
const companion = { slug: 'plasma-next-order', title: 'Next-order energies of 2-D plasmas' }

function hex64(seed: number): string {
  return seed.toString(16).padStart(2, '0').repeat(32)
}

function configuration(index: number, overrides: Partial<ManifestConfiguration> = {}): ManifestConfiguration {
  return { index, N: 400, d: 2, checksum: hex64(index + 100), labels: { seed: index }, ...overrides }
}

function ensemble(id: number, overrides: Partial<ManifestEnsemble> = {}): ManifestEnsemble {
  return {
    id,
    name: `β = 2, N = ${100 * id}`,
    fileName: `run-${id}.csv`,
    format: 'text',
    sha256: hex64(id),
    sizeBytes: 1000 * id,
    objectKey: `ensembles/${id}.csv`,
    geometry: { kind: 'plane' },
    kernel: { name: 'log' },
    potential: 'quadratic',
    beta: 2,
    convention: { pairs: 'full', fieldScale: 'N', logSign: 'minus-log', gibbs: 'beta/2' },
    labels: { sampler: 'exact' },
    configurations: [configuration(0), configuration(1)],
    ...overrides,
  }
}

function manifest(ensembles: ManifestEnsemble[]): Manifest {
  return { format: 'quillfield-manifest', version: 1, companion: { ...companion }, ensembles }
}

function clone<T>(value: T): T {
  return JSON.parse(JSON.stringify(value)) as T
}

// The same value with object keys in reverse insertion order (arrays keep their order).
function reverseKeys(value: unknown): unknown {
  if (Array.isArray(value)) {
    return value.map(reverseKeys)
  }
  if (value !== null && typeof value === 'object') {
    const out: Record<string, unknown> = {}
    for (const key of Object.keys(value).reverse()) {
      out[key] = reverseKeys((value as Record<string, unknown>)[key])
    }
    return out
  }
  return value
}

function systemGit(dir: string, ...args: string[]): string {
  return execFileSync('git', ['-C', dir, ...args], { encoding: 'utf8' })
}

async function expectRevisionError(promise: Promise<unknown>, code: string, message: RegExp | string): Promise<void> {
  const error: unknown = await promise.then(() => null, (e: unknown) => e)
  expect(error).toBeInstanceOf(RevisionError)
  expect((error as RevisionError).code).toBe(code)
  if (typeof message === 'string') {
    expect((error as RevisionError).message).toBe(message)
  }
  else {
    expect((error as RevisionError).message).toMatch(message)
  }
}

let root = ''
let dir = ''

beforeEach(() => {
  root = fs.mkdtempSync(path.join(os.tmpdir(), 'quillfield-revisions-'))
  dir = path.join(root, 'repositories', '7')
})

afterEach(() => {
  fs.rmSync(root, { recursive: true, force: true })
})

describe('opening a repository', () => {
  it('creates a git repository on main with the opening commit, once', async () => {
    const opened = await openRepository(dir, { author: ann, companion })
    expect(opened.created).toBe(true)
    expect(await git.currentBranch({ fs, dir })).toBe('main')
    const { commit } = await git.readCommit({ fs, dir, oid: opened.oid })
    expect(commit.message).toBe('Companion opened\n')
    expect(commit.parent).toEqual([])
    expect(commit.author.name).toBe(ann.name)
    expect(commit.author.email).toBe(ann.email)
    expect(await readManifest(dir)).toEqual(manifest([]))

    const again = await openRepository(dir, { author: ben, companion })
    expect(again).toEqual({ oid: opened.oid, created: false })
    expect(await listRevisions(dir)).toHaveLength(1)
  })

  it('says so when a companion has no repository', async () => {
    await expectRevisionError(headOid(dir), 'no-repository', /no revision repository/)
    await expectRevisionError(readManifest(dir), 'no-repository', /no revision repository/)
  })
})

describe('committing and reading manifests', () => {
  beforeEach(async () => {
    await openRepository(dir, { author: ann, companion })
  })

  it('round-trips a manifest through a commit, read from the commit and not the work tree', async () => {
    const m = manifest([ensemble(1), ensemble(2, { potential: null, beta: null, convention: null })])
    const { oid, changed } = await commitManifest(dir, m, { author: ann, message: 'Add two ensembles' })
    expect(changed).toBe(true)
    expect(await headOid(dir)).toBe(oid)
    expect(await readManifest(dir)).toEqual(m)
    expect(await readManifest(dir, oid)).toEqual(m)
    expect(await readManifest(dir, oid.toUpperCase())).toEqual(m)

    // Spoil the work tree: reading still uses the committed tree.
    fs.writeFileSync(path.join(dir, 'manifest.json'), 'not json')
    expect(await readManifest(dir)).toEqual(m)
  })

  it('writes the manifest canonically: sorted keys, two-space indentation, one trailing newline', async () => {
    const m = manifest([ensemble(1)])
    const { oid } = await commitManifest(dir, m, { author: ann, message: 'Add an ensemble' })
    const { blob } = await git.readBlob({ fs, dir, oid, filepath: 'manifest.json' })
    const text = new TextDecoder().decode(blob)
    expect(text).toBe(canonicalManifestJson(m))
    expect(text.endsWith('}\n')).toBe(true)
    expect(text.endsWith('\n\n')).toBe(false)
    expect(text.split('\n')[1]).toMatch(/^ {2}"/)
    const parsed = JSON.parse(text) as Record<string, unknown>
    expect(parsed).toEqual(m)
    // JSON.parse keeps the textual order of (non-numeric) keys, so these show the stored order.
    expect(Object.keys(parsed)).toEqual(Object.keys(parsed).sort())
    const first = (parsed.ensembles as Array<Record<string, unknown>>)[0]!
    expect(Object.keys(first)).toEqual(Object.keys(first).sort())
    // Key order of the input does not matter.
    expect(canonicalManifestJson(reverseKeys(m) as Manifest)).toBe(text)
    // The work tree follows the commit.
    expect(fs.readFileSync(path.join(dir, 'manifest.json'), 'utf8')).toBe(text)
  })

  it('records the author name and e-mail of each commit', async () => {
    const { oid } = await commitManifest(dir, manifest([ensemble(1)]), { author: ben, message: 'Ben adds data' })
    const { commit } = await git.readCommit({ fs, dir, oid })
    expect(commit.author.name).toBe(ben.name)
    expect(commit.author.email).toBe(ben.email)
    expect(commit.committer.name).toBe(ben.name)
    expect(commit.message).toBe('Ben adds data\n')
  })

  it('commits nothing when the manifest did not change, whatever its key order', async () => {
    const m = manifest([ensemble(1)])
    const first = await commitManifest(dir, m, { author: ann, message: 'Add an ensemble' })
    const again = await commitManifest(dir, reverseKeys(clone(m)) as Manifest, { author: ben, message: 'Same again' })
    expect(again).toEqual({ oid: first.oid, changed: false })
    expect(await headOid(dir)).toBe(first.oid)
    expect(await listRevisions(dir)).toHaveLength(2)
  })

  it('keeps other files of the tree when the manifest changes', async () => {
    // A page file committed beside the manifest (as later parts of a companion will be).
    const head = await headOid(dir)
    const { tree } = await git.readTree({ fs, dir, oid: head })
    const page = await git.writeBlob({ fs, dir, blob: new TextEncoder().encode('# Page\n') })
    const withPage = await git.writeTree({ fs, dir, tree: [...tree, { mode: '100644', path: 'page.md', oid: page, type: 'blob' }] })
    await git.commit({ fs, dir, ref: 'refs/heads/main', tree: withPage, parent: [head], message: 'Page', author: ann })

    const { oid } = await commitManifest(dir, manifest([ensemble(1)]), { author: ann, message: 'Add an ensemble' })
    const files = (await git.readTree({ fs, dir, oid })).tree.map(entry => entry.path).sort()
    expect(files).toEqual(['manifest.json', 'page.md'])
  })

  it('refuses manifests that are not valid, naming where', async () => {
    const options = { author: ann, message: 'Bad' }
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1, { beta: Number.NaN })]), options),
      'invalid-manifest', 'manifest value at ensembles[0].beta is NaN; JSON holds only finite numbers')
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1), ensemble(1)]), options),
      'invalid-manifest', 'manifest is not valid: ensembles[1] repeats ensemble id 1')
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1, { sha256: 'abc' })]), options),
      'invalid-manifest', /ensembles\[0\]\.sha256: expected 64 lowercase hexadecimal digits/)
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1, { configurations: [configuration(0), configuration(0)] })]), options),
      'invalid-manifest', 'manifest is not valid: ensembles[0].configurations[1] repeats configuration index 0')
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1, { geometry: undefined })]), options),
      'invalid-manifest', 'manifest is not valid: ensembles[0].geometry: is missing (use null when unknown)')
    await expectRevisionError(commitManifest(dir, manifest([ensemble(1, { configurations: [configuration(0, { N: 2.5 })] })]), options),
      'invalid-manifest', /ensembles\[0\]\.configurations\[0\]\.N/)
    expect(await listRevisions(dir)).toHaveLength(1)
  })

  it('updates the manifest from a returned value, commits nothing for no change, and nothing for an invalid one', async () => {
    const updated = await updateManifest(dir, m => ({ ...m, ensembles: [ensemble(9)] }), { author: ann, message: 'Replace' })
    expect(updated.changed).toBe(true)
    expect(updated.manifest).toEqual(manifest([ensemble(9)]))
    expect(await headOid(dir)).toBe(updated.oid)
    const none = await updateManifest(dir, () => undefined, { author: ann, message: 'Nothing' })
    expect(none).toEqual({ oid: updated.oid, changed: false, manifest: manifest([ensemble(9)]) })
    await expectRevisionError(updateManifest(dir, (m) => {
      m.ensembles[0]!.sizeBytes = -1
    }, { author: ann, message: 'Bad' }), 'invalid-manifest', /ensembles\[0\]\.sizeBytes/)
    expect(await headOid(dir)).toBe(updated.oid)
  })

  it('refuses authors and messages that would corrupt a commit', async () => {
    const m = manifest([ensemble(1)])
    await expectRevisionError(commitManifest(dir, m, { author: { name: 'Eve <x>', email: 'eve@example.org' }, message: 'x' }),
      'invalid-argument', /name may not contain/)
    await expectRevisionError(commitManifest(dir, m, { author: { name: 'Eve', email: '' }, message: 'x' }),
      'invalid-argument', /non-empty name and e-mail/)
    await expectRevisionError(commitManifest(dir, m, { author: ann, message: '  \n ' }),
      'invalid-argument', /non-empty message/)
  })
})

describe('history', () => {
  it('lists revisions newest first with author, time and parents', async () => {
    const opened = await openRepository(dir, { author: ann, companion, date: new Date('2026-03-01T10:00:00Z') })
    const a = await commitManifest(dir, manifest([ensemble(1)]), { author: ann, message: 'First data', date: new Date('2026-03-02T10:00:00Z') })
    const b = await commitManifest(dir, manifest([ensemble(1), ensemble(2)]), { author: ben, message: 'Second data\n\nWith a body.', date: new Date('2026-03-03T10:00:00Z') })
    const revisions = await listRevisions(dir)
    expect(revisions.map(r => r.oid)).toEqual([b.oid, a.oid, opened.oid])
    expect(revisions.map(r => r.message)).toEqual(['Second data\n\nWith a body.', 'First data', 'Companion opened'])
    expect(revisions.map(r => r.author)).toEqual([ben, ann, ann])
    expect(revisions.map(r => r.timestamp)).toEqual(['2026-03-03T10:00:00.000Z', '2026-03-02T10:00:00.000Z', '2026-03-01T10:00:00.000Z'])
    expect(revisions.map(r => r.parents)).toEqual([[a.oid], [opened.oid], []])
    expect(revisions[0]!.shortOid).toBe(b.oid.slice(0, 7))
    expect((await listRevisions(dir, { limit: 2 })).map(r => r.oid)).toEqual([b.oid, a.oid])
    expect(await readRevision(dir, a.oid)).toEqual(revisions[1])
    await expectRevisionError(listRevisions(dir, { limit: 0 }), 'invalid-argument', /positive whole number/)
  })

  it('rejects malformed and unknown revision ids with clear messages', async () => {
    await openRepository(dir, { author: ann, companion })
    await expectRevisionError(readManifest(dir, 'abc123'), 'invalid-oid', /40 hexadecimal digits, got «abc123»/)
    const unknown = '0123456789abcdef0123456789abcdef01234567'
    await expectRevisionError(readManifest(dir, unknown), 'unknown-revision', `no revision ${unknown} in this companion`)
    await expectRevisionError(diffRevisions(dir, unknown, await headOid(dir)), 'unknown-revision', `no revision ${unknown} in this companion`)
    await expectRevisionError(restoreRevision(dir, unknown, { author: ann }), 'unknown-revision', `no revision ${unknown} in this companion`)
    await expectRevisionError(resetTo(dir, 'HEAD'), 'invalid-oid', /40 hexadecimal digits/)
  })

  it('is a real git repository that the system git reads (common practice)', async () => {
    await openRepository(dir, { author: ann, companion })
    await commitManifest(dir, manifest([ensemble(1)]), { author: ben, message: 'Ben adds data' })
    await commitManifest(dir, manifest([ensemble(1), ensemble(2)]), { author: ann, message: 'Ann adds more' })
    expect(systemGit(dir, 'log', '--format=%an%x09%s').trimEnd().split('\n')).toEqual([
      `${ann.name}\tAnn adds more`,
      `${ben.name}\tBen adds data`,
      `${ann.name}\tCompanion opened`,
    ])
    expect(systemGit(dir, 'log', '-1', '--format=%ae').trim()).toBe(ann.email)
    expect(systemGit(dir, 'rev-parse', '--abbrev-ref', 'HEAD').trim()).toBe('main')
    expect(systemGit(dir, 'rev-parse', 'HEAD').trim()).toBe(await headOid(dir))
    expect(systemGit(dir, 'show', 'HEAD:manifest.json')).toBe(canonicalManifestJson(manifest([ensemble(1), ensemble(2)])))
    expect(systemGit(dir, 'status', '--porcelain')).toBe('')
    systemGit(dir, 'fsck', '--strict', '--no-progress')
  })
})

describe('differences between revisions', () => {
  it('lists added, removed and changed ensembles field by field, in plain words', async () => {
    await openRepository(dir, { author: ann, companion })
    const before = manifest([ensemble(1), ensemble(2), ensemble(3, { configurations: [configuration(0), configuration(1), configuration(2)] })])
    const three = ensemble(3, {
      beta: 4,
      convention: { pairs: 'half', fieldScale: 'N', logSign: 'minus-log' },
      labels: { sampler: 'exact', seed: 11 },
      geometry: { kind: 'sphere', radius: 1 },
      configurations: [
        configuration(1, { checksum: hex64(201) }),
        configuration(2, { labels: { seed: 2, accepted: true } }),
        configuration(3),
        configuration(4),
        configuration(5),
      ],
    })
    const after = manifest([ensemble(2, { name: 'β = 2, N = 200 (rerun)' }), three, ensemble(4)])
    after.companion.title = 'Next-order energies of two-dimensional plasmas'
    const a = await commitManifest(dir, before, { author: ann, message: 'Before' })
    const b = await commitManifest(dir, after, { author: ann, message: 'After' })

    const diff = await diffRevisions(dir, a.oid, b.oid)
    expect(diff.from.oid).toBe(a.oid)
    expect(diff.to.oid).toBe(b.oid)
    expect(diff.identical).toBe(false)
    expect(diff.added.map(e => e.id)).toEqual([4])
    expect(diff.removed.map(e => e.id)).toEqual([1])
    expect(diff.changed.map(e => e.id)).toEqual([2, 3])
    const changedThree = diff.changed[1]!
    expect(changedThree.fields).toContainEqual({ field: 'convention', key: 'pairs', kind: 'changed', from: 'full', to: 'half' })
    expect(changedThree.fields).toContainEqual({ field: 'convention', key: 'gibbs', kind: 'removed', from: 'beta/2' })
    expect(changedThree.fields).toContainEqual({ field: 'beta', key: '', kind: 'changed', from: 2, to: 4 })
    expect(changedThree.configurations.added).toEqual([3, 4, 5])
    expect(changedThree.configurations.removed).toEqual([0])
    expect(changedThree.configurations.changed.map(c => c.index)).toEqual([1, 2])
    expect(diff.lines).toEqual([
      'Companion title changed from «Next-order energies of 2-D plasmas» to «Next-order energies of two-dimensional plasmas»',
      'Ensemble 1 «β = 2, N = 100» removed (2 configurations from run-1.csv)',
      'Ensemble 2 «β = 2, N = 200 (rerun)»: name changed from «β = 2, N = 200» to «β = 2, N = 200 (rerun)»',
      'Ensemble 3 «β = 2, N = 300»: β changed from 2 to 4',
      'Ensemble 3 «β = 2, N = 300»: geometry kind changed from plane to sphere',
      'Ensemble 3 «β = 2, N = 300»: geometry radius set to 1',
      'Ensemble 3 «β = 2, N = 300»: convention gibbs removed (was beta/2)',
      'Ensemble 3 «β = 2, N = 300»: convention pairs changed from full to half',
      'Ensemble 3 «β = 2, N = 300»: label seed set to 11',
      'Ensemble 3 «β = 2, N = 300»: configurations 3–5 added',
      'Ensemble 3 «β = 2, N = 300»: configuration 0 removed',
      `Ensemble 3 «β = 2, N = 300»: configuration 1 checksum changed from ${hex64(101).slice(0, 12)}… to ${hex64(201).slice(0, 12)}…`,
      'Ensemble 3 «β = 2, N = 300»: configuration 2: label accepted set to true',
      'Ensemble 4 «β = 2, N = 400» added (2 configurations from run-4.csv)',
    ])

    const same = await diffRevisions(dir, b.oid, b.oid)
    expect(same.identical).toBe(true)
    expect(same.lines).toEqual([])
  })

  it('groups configurations that changed alike and describes whole-field changes', () => {
    const before = manifest([ensemble(5, { potential: null, convention: null })])
    const after = manifest([ensemble(5, {
      potential: 'quartic',
      convention: { pairs: 'half' },
      sizeBytes: 7000,
      configurations: [configuration(0, { checksum: hex64(1), N: 500 }), configuration(1, { checksum: hex64(2), N: 500 })],
    })])
    expect(diffManifests(before, after).lines).toEqual([
      'Ensemble 5 «β = 2, N = 500»: file size changed from 5000 bytes to 7000 bytes',
      'Ensemble 5 «β = 2, N = 500»: potential changed from none to quartic',
      'Ensemble 5 «β = 2, N = 500»: convention changed from none to {"pairs":"half"}',
      'Ensemble 5 «β = 2, N = 500»: checksum changed for configurations 0, 1',
      'Ensemble 5 «β = 2, N = 500»: configurations 0, 1: N changed from 400 to 500',
    ])
  })

  it('keeps and compares fields beyond the declared ones', async () => {
    await openRepository(dir, { author: ann, companion })
    const withBox = (max: number) => ({ ...configuration(0), bbox: { min: [0, 0], max: [max, 1] }, minDistance: null })
    const a = manifest([ensemble(1, { configurations: [withBox(1)] })])
    const b = manifest([ensemble(1, { configurations: [withBox(2)] })])
    await commitManifest(dir, a, { author: ann, message: 'With boxes' })
    expect(await readManifest(dir)).toEqual(a)
    expect(diffManifests(a, b).lines).toEqual(['Ensemble 1 «β = 2, N = 100»: configuration 0: bbox max changed from [1,1] to [2,1]'])
  })

  it('writes index lists as ranges', () => {
    expect(indexRanges([9, 0, 1, 2, 3, 7, 10])).toBe('0–3, 7, 9, 10')
    expect(indexRanges([4])).toBe('4')
    expect(indexRanges([])).toBe('')
  })
})

describe('restoring and resetting', () => {
  it('restores an old revision as a new commit and keeps the history', async () => {
    await openRepository(dir, { author: ann, companion })
    const oldManifest = manifest([ensemble(1)])
    const a = await commitManifest(dir, oldManifest, { author: ann, message: 'First data\n\nDetails.' })
    const b = await commitManifest(dir, manifest([ensemble(1, { beta: 6 }), ensemble(2)]), { author: ann, message: 'Second data' })
    const restored = await restoreRevision(dir, a.oid, { author: ben })
    expect(restored.changed).toBe(true)
    expect(restored.manifest).toEqual(oldManifest)
    expect(await readManifest(dir)).toEqual(oldManifest)
    expect(await headOid(dir)).toBe(restored.oid)
    const revisions = await listRevisions(dir)
    expect(revisions.map(r => r.oid)).toEqual([restored.oid, b.oid, a.oid, expect.any(String)])
    expect(revisions[0]!.message).toBe(`Restored revision ${a.oid.slice(0, 7)}: First data`)
    expect(revisions[0]!.author).toEqual(ben)
    expect(revisions[0]!.parents).toEqual([b.oid])
    expect((await git.readCommit({ fs, dir, oid: restored.oid })).commit.tree).toBe((await git.readCommit({ fs, dir, oid: a.oid })).commit.tree)
    expect(fs.readFileSync(path.join(dir, 'manifest.json'), 'utf8')).toBe(canonicalManifestJson(oldManifest))
    expect(systemGit(dir, 'status', '--porcelain')).toBe('')

    // Restoring what is already current commits nothing.
    expect(await restoreRevision(dir, a.oid, { author: ben })).toEqual({ oid: restored.oid, manifest: oldManifest, changed: false })
  })

  it('moves main back with resetTo and refuses to move it forward', async () => {
    await openRepository(dir, { author: ann, companion })
    const kept = manifest([ensemble(1)])
    const a = await commitManifest(dir, kept, { author: ann, message: 'Kept' })
    const b = await commitManifest(dir, manifest([ensemble(1), ensemble(2)]), { author: ann, message: 'Undone' })
    expect(await resetTo(dir, a.oid)).toEqual({ oid: a.oid, previous: b.oid })
    expect(await headOid(dir)).toBe(a.oid)
    expect((await listRevisions(dir)).map(r => r.message)).toEqual(['Kept', 'Companion opened'])
    expect(await readManifest(dir)).toEqual(kept)
    expect(fs.readFileSync(path.join(dir, 'manifest.json'), 'utf8')).toBe(canonicalManifestJson(kept))
    expect(systemGit(dir, 'status', '--porcelain')).toBe('')
    expect(systemGit(dir, 'rev-parse', 'main').trim()).toBe(a.oid)
    // The undone commit is no longer a revision of the companion.
    await expectRevisionError(readManifest(dir, b.oid), 'unknown-revision', `no revision ${b.oid} in this companion`)
    await expectRevisionError(resetTo(dir, b.oid), 'not-an-ancestor', /can only be moved back/)
    // Resetting to the head changes nothing.
    expect(await resetTo(dir, a.oid)).toEqual({ oid: a.oid, previous: a.oid })
  })

  it('undoes a commit whose follow-up step failed, inside one hold of the lock', async () => {
    await openRepository(dir, { author: ann, companion })
    const start = await headOid(dir)
    const failure = await withRepositoryLock(dir, async () => {
      const before = await headOid(dir)
      await commitManifest(dir, manifest([ensemble(1)]), { author: ann, message: 'Tentative' })
      try {
        throw new Error('database transaction failed')
      }
      catch (error) {
        await resetTo(dir, before)
        return error as Error
      }
    })
    expect(failure.message).toBe('database transaction failed')
    expect(await headOid(dir)).toBe(start)
    expect(await listRevisions(dir)).toHaveLength(1)
  })
})

describe('the repository lock', () => {
  it('serialises concurrent updates into a linear history holding every change', async () => {
    await openRepository(dir, { author: ann, companion })
    const ids = [1, 2, 3, 4, 5, 6, 7, 8]
    const results = await Promise.all(ids.map(id => updateManifest(dir, (m) => {
      m.ensembles.push(ensemble(id))
    }, { author: id % 2 === 0 ? ann : ben, message: `Add ensemble ${id}` })))
    expect(results.every(r => r.changed)).toBe(true)
    const final = await readManifest(dir)
    expect(final.ensembles.map(e => e.id)).toEqual(ids)
    const revisions = await listRevisions(dir)
    expect(revisions).toHaveLength(ids.length + 1)
    for (let i = 0; i + 1 < revisions.length; i++) {
      expect(revisions[i]!.parents).toEqual([revisions[i + 1]!.oid])
    }
    expect(revisions.map(r => r.message).reverse()).toEqual(['Companion opened', ...ids.map(id => `Add ensemble ${id}`)])
    expect(systemGit(dir, 'rev-list', '--count', '--merges', 'HEAD').trim()).toBe('0')
  })

  it('serialises read–modify–write sequences wrapped by the caller', async () => {
    await openRepository(dir, { author: ann, companion })
    const ids = [11, 12, 13, 14, 15]
    await Promise.all(ids.map(id => withRepositoryLock(dir, async () => {
      const m = await readManifest(dir)
      m.ensembles.push(ensemble(id))
      return await commitManifest(dir, m, { author: ann, message: `Add ${id}` })
    })))
    expect((await readManifest(dir)).ensembles.map(e => e.id)).toEqual(ids)
    expect(await listRevisions(dir)).toHaveLength(ids.length + 1)
  })

  it('never runs two holders at once, survives a failing holder, and is re-entrant', async () => {
    let active = 0
    let most = 0
    const order: number[] = []
    const holder = (k: number) => withRepositoryLock(dir, async () => {
      active++
      most = Math.max(most, active)
      await new Promise(resolve => setImmediate(resolve))
      order.push(k)
      active--
      if (k === 2) {
        throw new Error('holder 2 failed')
      }
      // Re-entrant: the same directory inside the lock runs at once.
      return await withRepositoryLock(path.join(dir, '.'), () => k)
    })
    const settled = await Promise.allSettled([0, 1, 2, 3, 4].map(holder))
    expect(most).toBe(1)
    expect(order).toEqual([0, 1, 2, 3, 4])
    expect(settled.map(s => s.status)).toEqual(['fulfilled', 'fulfilled', 'rejected', 'fulfilled', 'fulfilled'])
    expect(settled[4]).toEqual({ status: 'fulfilled', value: 4 })
  })

  it('does not make one repository wait for another', async () => {
    const other = path.join(root, 'repositories', '8')
    let releaseFirst: () => void = () => {}
    const gate = new Promise<void>((resolve) => {
      releaseFirst = resolve
    })
    const first = withRepositoryLock(dir, () => gate)
    // If the second lock waited for the first, this would never settle and the test would time out.
    const second = await withRepositoryLock(other, () => 'other done')
    expect(second).toBe('other done')
    releaseFirst()
    await first
  })
})
