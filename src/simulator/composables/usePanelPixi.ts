// The Pixi application's life on a canvas the component owns: created on mount, destroyed on
// unmount (also when unmount comes before init has finished), with the scene scaled to fit.
import { onBeforeUnmount, onMounted, ref, markRaw, type Ref } from 'vue'
import { Application, UPDATE_PRIORITY, type Ticker } from 'pixi.js'
// The app's Content-Security-Policy forbids eval; this makes Pixi build its shaders without it.
import 'pixi.js/unsafe-eval'
import { PanelScene } from '@/simulator/scene/scene'
import type { PanelLayout, Vec } from '@/simulator/scene/types'
import type { PanelView } from '@/simulator/scene/view'

declare global {
  interface Window {
    /** Filled only when the page was opened with ?perf: per-frame script time for measurement. */
    __slipwayFrameTimes?: number[]
  }
}

export function usePanelPixi(
  canvas: Ref<HTMLCanvasElement | null>,
  host: Ref<HTMLElement | null>,
  layout: PanelLayout,
  frame: (wallDtMs: number) => PanelView,
) {
  const ready = ref(false)
  const error = ref<string | null>(null)
  let app: Application | null = null
  let disposed = false
  let observer: ResizeObserver | null = null
  const callbacks: { fn: (t: Ticker) => void; priority: number }[] = []

  function fit() {
    const el = host.value
    if (!app || !el) return
    const width = Math.max(320, el.clientWidth)
    const height = Math.round((width * layout.height) / layout.width)
    app.renderer.resize(width, height)
    app.stage.scale.set(width / layout.width)
    app.render()
  }

  onMounted(async () => {
    const el = canvas.value
    if (!el) return
    const created = markRaw(new Application())
    try {
      await created.init({
        canvas: el,
        width: layout.width,
        height: layout.height,
        background: 0xe6eaee,
        antialias: true,
        preference: 'webgl',
        autoDensity: true,
        resolution: Math.min(2, window.devicePixelRatio || 1),
      })
    } catch (e) {
      if (!disposed) error.value = `The panel could not start its graphics: ${(e as Error).message}`
      return
    }
    if (disposed) {
      created.destroy(true, { children: true, texture: true })
      return
    }
    app = created
    const scene = markRaw(new PanelScene(layout))
    created.stage.addChild(scene.root)

    const perf = new URLSearchParams(window.location.search).has('perf')
    let frameStart = 0
    if (perf) {
      window.__slipwayFrameTimes = []
      callbacks.push({
        fn: () => (frameStart = performance.now()),
        priority: UPDATE_PRIORITY.INTERACTION + 1,
      })
      // Runs last, so the frame's drawing (done in the NORMAL callback) is included.
      callbacks.push({
        fn: () => window.__slipwayFrameTimes?.push(performance.now() - frameStart),
        priority: UPDATE_PRIORITY.UTILITY - 1,
      })
    }
    // Draw only frames that changed: an idle panel costs nothing (and SwiftShader stays responsive).
    created.ticker.remove(created.render, created)
    let needsRender = true
    callbacks.push({
      fn: (ticker) => {
        const changed = scene.update(frame(ticker.deltaMS))
        const turned = scene.tick(ticker.deltaMS)
        if (changed || turned || needsRender) {
          needsRender = false
          created.render()
        }
      },
      priority: UPDATE_PRIORITY.NORMAL,
    })
    for (const c of callbacks) created.ticker.add(c.fn, undefined, c.priority)

    if (host.value && typeof ResizeObserver !== 'undefined') {
      observer = new ResizeObserver(fit)
      observer.observe(host.value)
    }
    fit()
    ready.value = true
  })

  onBeforeUnmount(() => {
    disposed = true
    observer?.disconnect()
    observer = null
    if (app) {
      for (const c of callbacks) app.ticker.remove(c.fn)
      app.destroy(true, { children: true, texture: true })
      app = null
    }
    callbacks.length = 0
  })

  /** Client (CSS pixel) coordinates to scene units. */
  function toScene(clientX: number, clientY: number): Vec {
    const el = canvas.value
    if (!el) return { x: 0, y: 0 }
    const r = el.getBoundingClientRect()
    return {
      x: ((clientX - r.left) / r.width) * layout.width,
      y: ((clientY - r.top) / r.height) * layout.height,
    }
  }

  return { ready, error, toScene }
}
