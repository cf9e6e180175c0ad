// Launches headless Debian Chromium through playwright-core with a fresh profile per launch.
import { mkdtempSync, mkdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { chromium, type BrowserContext, type Page } from 'playwright-core'
import { chromiumPath } from './chromium'

// Flags measured on this machine: the closed network refuses Chromium's background
// connections, and SwiftShader must be allowed explicitly for WebGL (Pixi) to work headless.
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--no-first-run',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--enable-unsafe-swiftshader',
]

export const SCREENSHOT_DIR = resolve('test-results/screenshots')

export interface BrowserSession {
  context: BrowserContext
  page: Page
  close(): Promise<void>
}

export async function launchBrowser(
  options: {
    width?: number
    height?: number
    colorScheme?: 'light' | 'dark'
    hasTouch?: boolean
    args?: string[]
  } = {},
): Promise<BrowserSession> {
  const profile = mkdtempSync(join(tmpdir(), 'slipway-chromium-'))
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: chromiumPath(),
    headless: true,
    args: [...CHROMIUM_ARGS, ...(options.args ?? [])],
    viewport: { width: options.width ?? 1366, height: options.height ?? 900 },
    colorScheme: options.colorScheme ?? 'light',
    hasTouch: options.hasTouch ?? false,
  })
  const page = context.pages()[0] ?? (await context.newPage())
  return {
    context,
    page,
    async close() {
      await context.close()
      rmSync(profile, { recursive: true, force: true })
    },
  }
}

/** Saves a full-page screenshot as a test artifact and returns its path. */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  const path = join(SCREENSHOT_DIR, name.endsWith('.png') ? name : `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}
