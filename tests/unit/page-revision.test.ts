// The page text in a revision: page.md is committed beside the manifest in one commit, read back
// by revision, kept by later manifest-only commits, and checked with git itself (the reference
// implementation).
import { execFileSync } from 'node:child_process'
import fs from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { afterEach, beforeEach, describe, expect, it } from 'vitest'
import { commitManifest, headOid, listRevisions, openRepository, readManifest, readRevisionFile, RevisionError } from '../../server/utils/revisions'

const author = { name: 'Ann Harbour', email: 'ann@harbour-lane.example' }
const companion = { slug: 'plasma-page', title: 'A page for a plasma' }
let dir = ''

beforeEach(async () => {
  dir = fs.mkdtempSync(path.join(os.tmpdir(), 'qf-page-'))
  await openRepository(dir, { author, companion })
})
afterEach(() => fs.rmSync(dir, { recursive: true, force: true }))

describe('page.md in revisions', () => {
  it('commits page.md with the manifest in one commit and reads it back by revision', async () => {
    const manifest = await readManifest(dir)
    const first = await commitManifest(dir, manifest, { author, message: 'Write the page', files: { 'page.md': '# First\n' } })
    expect(first.changed).toBe(true)
    const second = await commitManifest(dir, manifest, { author, message: 'Edit the page', files: { 'page.md': '# Second\n' } })
    expect(second.changed).toBe(true)
    expect(await readRevisionFile(dir, first.oid, 'page.md')).toBe('# First\n')
    expect(await readRevisionFile(dir, 'HEAD', 'page.md')).toBe('# Second\n')
    expect((await listRevisions(dir)).map(r => r.message)).toEqual(['Edit the page', 'Write the page', 'Companion opened'])
    expect(execFileSync('git', ['-C', dir, 'show', `${first.oid}:page.md`], { encoding: 'utf8' })).toBe('# First\n')
    expect(execFileSync('git', ['-C', dir, 'ls-tree', '--name-only', second.oid], { encoding: 'utf8' }).split('\n').filter(Boolean)).toEqual(['manifest.json', 'page.md'])
  })

  it('makes no commit when neither the manifest nor page.md changed', async () => {
    const manifest = await readManifest(dir)
    const first = await commitManifest(dir, manifest, { author, message: 'Write the page', files: { 'page.md': 'Same text.' } })
    const again = await commitManifest(dir, manifest, { author, message: 'Write it again', files: { 'page.md': 'Same text.' } })
    expect(again).toEqual({ oid: first.oid, changed: false })
  })

  it('keeps page.md through a later commit of the manifest alone', async () => {
    const manifest = await readManifest(dir)
    await commitManifest(dir, manifest, { author, message: 'Write the page', files: { 'page.md': 'Kept.' } })
    await commitManifest(dir, { ...manifest, companion: { ...manifest.companion, title: 'Renamed' } }, { author, message: 'Rename' })
    expect(await readRevisionFile(dir, await headOid(dir), 'page.md')).toBe('Kept.')
  })

  it('answers null for a revision without page.md, and refuses file names outside the top folder', async () => {
    expect(await readRevisionFile(dir, 'HEAD', 'page.md')).toBeNull()
    const manifest = await readManifest(dir)
    await expect(commitManifest(dir, manifest, { author, message: 'x', files: { '../page.md': 'x' } })).rejects.toBeInstanceOf(RevisionError)
    await expect(commitManifest(dir, manifest, { author, message: 'x', files: { 'manifest.json': '{}' } })).rejects.toBeInstanceOf(RevisionError)
  })
})
