// Gzipped JavaScript that a route loads, read from the Vite manifest of the production build.
import { existsSync, readFileSync } from 'node:fs'
import { gzipSync } from 'node:zlib'
import { join, resolve } from 'node:path'
import type { BenchRow } from './table'

interface ManifestChunk {
  file: string
  src?: string
  isEntry?: boolean
  imports?: string[]
  dynamicImports?: string[]
  css?: string[]
}
type Manifest = Record<string, ManifestChunk>

const distDir = resolve('dist/client')

function gzippedBytes(file: string): number {
  return gzipSync(readFileSync(join(distDir, file)), { level: 9 }).length
}

/** The chunk and everything it imports statically (what the browser must fetch before it runs). */
function staticClosure(manifest: Manifest, key: string, seen = new Set<string>()): Set<string> {
  if (seen.has(key)) return seen
  seen.add(key)
  for (const imported of manifest[key]?.imports ?? []) staticClosure(manifest, imported, seen)
  return seen
}

function jsBytes(manifest: Manifest, keys: Iterable<string>): number {
  let total = 0
  for (const key of keys) total += gzippedBytes(manifest[key]!.file)
  return total
}

export function runBundleBench(): BenchRow[] {
  const manifestPath = join(distDir, '.vite/manifest.json')
  if (!existsSync(manifestPath)) throw new Error('No production build: run `npm run build:client` first.')
  const manifest = JSON.parse(readFileSync(manifestPath, 'utf8')) as Manifest
  const entryKey = Object.keys(manifest).find((key) => manifest[key]!.isEntry)!
  const entry = staticClosure(manifest, entryKey)
  const rows: BenchRow[] = [
    {
      group: 'bundle',
      name: 'entry chunk + static imports (JS, gzip)',
      value: jsBytes(manifest, entry) / 1024,
      unit: 'KB',
    },
  ]
  const signInKey = Object.keys(manifest).find((key) => /SignInView\.vue$/.test(key))
  if (signInKey) {
    const signIn = staticClosure(manifest, signInKey, new Set(entry))
    rows.push({
      group: 'bundle',
      name: 'sign-in page JS (entry + its view, gzip)',
      value: jsBytes(manifest, signIn) / 1024,
      unit: 'KB',
      target: '< 150 KB',
      met: jsBytes(manifest, signIn) / 1024 < 150,
    })
  }
  const panelKey = Object.keys(manifest).find((key) => /SimulatorPanel\.vue$/.test(key))
  if (panelKey) {
    const panel = staticClosure(manifest, panelKey)
    for (const key of entry) panel.delete(key)
    rows.push({
      group: 'bundle',
      name: 'panel chunk and its own imports (JS, gzip)',
      value: jsBytes(manifest, panel) / 1024,
      unit: 'KB',
    })
  }
  return rows
}
