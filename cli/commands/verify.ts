// verify: re-reads the data files of a downloaded companion archive and checks them against its
// manifest — file SHA-256, and N, d and checksum of every configuration.
import { dirname, join } from 'node:path'
import { configurationChecksum, sha256Hex } from '../../shared/physics/formats'
import { ENGINE_VERSION } from '../../shared/physics/version'
import type { EngineCommand } from '../command'
import { UsageError } from '../command'
import { requireString } from '../setting'
import { readStoredEnsemble } from '../../shared/physics/formats/stored'

interface ManifestLike {
  format?: string
  ensembles: Array<{ id: number, name: string, fileName: string, format: string, sha256: string, configurations: Array<{ index: number, N: number, d: number, checksum: string }> }>
}

export function archivePath(e: { id: number, fileName: string }): string {
  return `data/${e.id}-${e.fileName.replace(/[^\w.-]+/g, '_')}`
}

export const command: EngineCommand = {
  name: 'verify',
  summary: 'check a downloaded companion archive against its manifest: file SHA-256 and every configuration\'s N, d and checksum',
  options: [{ name: 'manifest', type: 'string', description: 'manifest.json of an unpacked archive (data files are found beside it)' }],
  async run(args, io) {
    const path = requireString(args, 'manifest')
    let manifest: ManifestLike
    try {
      manifest = JSON.parse(new TextDecoder().decode(io.readFile(path))) as ManifestLike
    }
    catch (error) {
      if (error instanceof SyntaxError) throw new UsageError(`${path} is not JSON`)
      throw error
    }
    if (manifest.format !== 'quillfield-manifest' || !Array.isArray(manifest.ensembles)) throw new UsageError(`${path} is not a Quillfield manifest`)
    const root = dirname(path)
    const results = []
    let problems = 0
    for (const e of manifest.ensembles) {
      const file = join(root, archivePath(e))
      const bytes = io.readFile(file)
      const sha256 = await sha256Hex(bytes)
      const { ensemble } = readStoredEnsemble(bytes, e.fileName)
      const mismatches: string[] = []
      if (sha256 !== e.sha256) mismatches.push(`file SHA-256 is ${sha256}, the manifest says ${e.sha256}`)
      if (ensemble.configurations.length !== e.configurations.length) mismatches.push(`${ensemble.configurations.length} configurations, the manifest lists ${e.configurations.length}`)
      for (const c of e.configurations) {
        const conf = ensemble.configurations[c.index]
        if (!conf) continue
        if (conf.N !== c.N || conf.d !== c.d) mismatches.push(`configuration ${c.index}: N = ${conf.N}, d = ${conf.d}; the manifest says N = ${c.N}, d = ${c.d}`)
        const checksum = await configurationChecksum(conf)
        if (checksum !== c.checksum) mismatches.push(`configuration ${c.index}: checksum ${checksum} differs from the manifest's ${c.checksum}`)
      }
      problems += mismatches.length
      results.push({ id: e.id, name: e.name, file: archivePath(e), configurations: e.configurations.length, ok: mismatches.length === 0, mismatches })
    }
    if (problems > 0) {
      const lines = results.flatMap(r => r.mismatches.map(m => `ensemble ${r.id} (${r.file}): ${m}`))
      throw new Error(`the archive does not match its manifest:\n${lines.join('\n')}`)
    }
    return { engineVersion: ENGINE_VERSION, manifest: path, verified: true, ensembles: results }
  },
}
