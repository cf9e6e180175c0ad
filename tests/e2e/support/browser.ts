// Launches headless Debian Chromium through playwright-core with a fresh profile per launch.
import { mkdtempSync, mkdirSync, rmSync } from 'node:fs'
import { tmpdir } from 'node:os'
import { join, resolve } from 'node:path'
import { chromium, type BrowserContext, type Page, type Request } from 'playwright-core'
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
  trackRequests(context)
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

/**
 * Saves a full-page screenshot (under test-results/, for people looking at the screens) and returns its
 * path. It also runs in CI: skipping it there changed the tests' timing and showed up two races (now fixed
 * in panel-energised and panel-replay); others may still hide behind a shot's second.
 */
export async function screenshot(page: Page, name: string): Promise<string> {
  mkdirSync(SCREENSHOT_DIR, { recursive: true })
  const path = join(SCREENSHOT_DIR, name.endsWith('.png') ? name : `${name}.png`)
  await page.screenshot({ path, fullPage: true })
  return path
}

/**
 * The live classroom's event streams (an apprentice's inbox, the class and watch streams) stay open as long
 * as their page does, so Playwright's `networkidle` never comes on those pages. Requests are counted here
 * instead, streams left out, and `networkQuiet` waits for the rest.
 */
const LONG_LIVED = /\/api\/live\/.+\/(inbox|stream)(\?|$)/
const inFlight = new WeakMap<Page, Set<Request>>()

function pageOf(request: Request): Page | null {
  try {
    return request.frame().page()
  } catch {
    return null // a service worker's request has no frame
  }
}

function trackRequests(context: BrowserContext) {
  const settle = (request: Request) => {
    const page = pageOf(request)
    if (page) inFlight.get(page)?.delete(request)
  }
  context.on('request', (request) => {
    const page = pageOf(request)
    if (!page || LONG_LIVED.test(request.url())) return
    const open = inFlight.get(page) ?? new Set<Request>()
    inFlight.set(page, open.add(request))
  })
  context.on('requestfinished', settle)
  context.on('requestfailed', settle)
}

/** Resolves once the page has had no request in flight, event streams aside, for `quietMs`. */
export async function networkQuiet(page: Page, { quietMs = 500, timeoutMs = 30_000 } = {}): Promise<void> {
  const deadline = Date.now() + timeoutMs
  let quietSince = Date.now()
  while (Date.now() < deadline) {
    if ((inFlight.get(page)?.size ?? 0) > 0) quietSince = Date.now()
    else if (Date.now() - quietSince >= quietMs) return
    await page.waitForTimeout(50)
  }
  throw new Error(`The page still had requests in flight after ${timeoutMs} ms`)
}
