export { launchBrowser, screenshot, CHROMIUM_ARGS, SCREENSHOT_DIR, type BrowserSession } from './browser'
export { startApp, freePort, type RunningApp } from './app-server'
export { ensureChromium, chromiumPath } from './chromium'
