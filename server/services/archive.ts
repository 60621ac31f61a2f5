// The companion at one revision as a zip archive: manifest, the stored data files byte for byte,
// SHA-256 sums and a README on re-verifying with the engine's command line. Entries are streamed
// from object storage into the zip as they arrive (stored, not compressed), with back-pressure.
import { createHash } from 'node:crypto'
import { PassThrough } from 'node:stream'
import { Zip, ZipDeflate, ZipPassThrough } from 'fflate'
import { ENGINE_VERSION } from '#shared/physics/version'
import type { CompanionRow } from '#shared/types/db'
import type { Manifest } from '../utils/revisions'

export function dataPathInArchive(e: { id: number, fileName: string }): string {
  return `data/${e.id}-${e.fileName.replace(/[^\w.-]+/g, '_')}`
}

function readme(companion: CompanionRow, manifest: Manifest, revision: string): string {
  return `# ${companion.title}

Companion \`${companion.slug}\` at revision ${revision}, exported by Quillfield (engine ${ENGINE_VERSION}).

- \`manifest.json\` lists every ensemble: its file, SHA-256, geometry, kernel, potential, β, the
  convention record its energies use, and one checksum per configuration.
- \`data/\` holds the files exactly as they were uploaded.
- \`page.md\`, when the companion has a page, holds its text (Markdown with math and figure directives).
- \`SHA256SUMS\` holds the SHA-256 of every file in this archive except itself.

## Re-verify

1. The bytes: \`sha256sum -c SHA256SUMS\` (or \`shasum -a 256 -c SHA256SUMS\`).
2. The configurations, with the engine's command line from the Quillfield repository
   (\`npm install\` once):

       npm run --silent engine -- verify --manifest manifest.json

   It re-reads every data file, recomputes N, d and the checksum of every configuration and
   compares them with the manifest; it exits non-zero on any difference.
3. Energies in the declared convention, for example:

${manifest.ensembles.slice(0, 3).map(e => `       npm run --silent engine -- energy --input ${dataPathInArchive(e)}${e.potential ? ` --potential "${e.potential}"` : ''} --geometry ${(e.geometry as { kind: string }).kind}`).join('\n') || '       npm run --silent engine -- energy --input data/<file> --potential "r^2"'}

   Every result names its convention and the engine version that computed it.
`
}

function sha256Of(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex')
}

export async function streamArchive(companion: CompanionRow, manifest: Manifest, revision: string, pageText: string | null = null): Promise<PassThrough> {
  const out = new PassThrough()
  const zip = new Zip((error, chunk, final) => {
    if (error) {
      out.destroy(error)
      return
    }
    out.write(chunk)
    if (final) out.end()
  })
  const drained = () => (out.writableNeedDrain ? new Promise<void>(resolve => out.once('drain', () => resolve())) : Promise.resolve())
  const encoder = new TextEncoder()
  const sums: string[] = []

  function addText(name: string, text: string) {
    const bytes = encoder.encode(text)
    sums.push(`${sha256Of(bytes)}  ${name}`)
    const entry = new ZipDeflate(name, { level: 6 })
    zip.add(entry)
    entry.push(bytes, true)
  }

  ;(async () => {
    addText('manifest.json', `${JSON.stringify(manifest, null, 2)}\n`)
    addText('README.md', readme(companion, manifest, revision))
    if (pageText) addText('page.md', pageText)
    for (const e of manifest.ensembles) {
      const name = dataPathInArchive(e)
      const entry = new ZipPassThrough(name)
      zip.add(entry)
      const body = await getObjectStream(e.objectKey)
      for await (const chunk of body) {
        entry.push(chunk as Uint8Array)
        await drained()
      }
      entry.push(new Uint8Array(0), true)
      sums.push(`${e.sha256}  ${name}`)
    }
    const list = new ZipDeflate('SHA256SUMS', { level: 6 })
    zip.add(list)
    list.push(encoder.encode(`${sums.join('\n')}\n`), true)
    zip.end()
  })().catch(error => out.destroy(error instanceof Error ? error : new Error(String(error))))
  return out
}
