// Finds Debian's Chromium for the browser tests, installing it when we are root with apt-get.
import { execFileSync, spawnSync } from 'node:child_process'
import { existsSync } from 'node:fs'

export const CHROMIUM_PACKAGE = 'chromium'

export function chromiumPath(): string {
  return process.env.CHROMIUM_PATH ?? '/usr/bin/chromium'
}

function canInstallWithApt(): boolean {
  const isRoot = typeof process.getuid === 'function' && process.getuid() === 0
  const hasApt = spawnSync('sh', ['-c', 'command -v apt-get'], { stdio: 'ignore' }).status === 0
  return isRoot && hasApt
}

/** Returns the browser's path, installing Debian's package first if it is missing and we may. */
export function ensureChromium(log: (line: string) => void = console.log): string {
  const path = chromiumPath()
  if (existsSync(path)) return path
  if (!canInstallWithApt()) {
    throw new Error(
      `Chromium not found at ${path}. Install Debian's "${CHROMIUM_PACKAGE}" package ` +
        `(apt-get install -y ${CHROMIUM_PACKAGE}) or set CHROMIUM_PATH to a Chromium binary.`,
    )
  }
  log(`Chromium missing at ${path}: installing Debian's "${CHROMIUM_PACKAGE}" package with apt-get…`)
  const env = { ...process.env, DEBIAN_FRONTEND: 'noninteractive' }
  execFileSync('apt-get', ['update'], { stdio: 'inherit', env })
  execFileSync('apt-get', ['install', '-y', CHROMIUM_PACKAGE], { stdio: 'inherit', env })
  if (!existsSync(path))
    throw new Error(`apt-get installed "${CHROMIUM_PACKAGE}" but ${path} is still missing.`)
  return path
}
