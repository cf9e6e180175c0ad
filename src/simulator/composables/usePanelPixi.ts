// The Pixi application's life on a canvas the component owns: created on mount, destroyed on unmount
// (also when unmount comes before init has finished). The canvas fills its host; a camera (scale and
// offset, see scene/camera.ts) places the scene in it, fitted until the user zooms or pans.
import { onBeforeUnmount, onMounted, ref, markRaw, shallowRef, type Ref } from 'vue'
import { Application, UPDATE_PRIORITY, type Ticker } from 'pixi.js'
// The app's Content-Security-Policy forbids eval; this makes Pixi build its shaders without it.
import 'pixi.js/unsafe-eval'
import { PanelScene } from '../scene/scene'
import { clampCamera, fitCamera, isFitted, toScene, type Camera, type Size } from '../scene/camera'
import type { PanelLayout, Vec } from '../scene/types'
import type { PanelView } from '../scene/view'

declare global {
  interface Window {
    /** Filled only when the page was opened with ?perf: per-frame script time for measurement. */
    __slipwayFrameTimes?: number[]
  }
}

/** Text textures are redrawn for the new zoom once zooming has paused this long. */
const TEXT_SETTLE_MS = 150
const MAX_TEXT_RESOLUTION = 6
/** A draw slower than this (software rendering) spaces out redraws of the turning shaft. */
const SLOW_DRAW_MS = 40

export function usePanelPixi(
  canvas: Ref<HTMLCanvasElement | null>,
  host: Ref<HTMLElement | null>,
  layout: PanelLayout,
  frame: (wallDtMs: number) => PanelView,
) {
  const ready = ref(false)
  const error = ref<string | null>(null)
  const camera = shallowRef<Camera>({ scale: 1, x: 0, y: 0 })
  const fitted = ref(true)
  const view: Size = { width: layout.width, height: layout.height }
  const sceneSize: Size = { width: layout.width, height: layout.height }
  let app: Application | null = null
  let scene: PanelScene | null = null
  let disposed = false
  let observer: ResizeObserver | null = null
  let textTimer: ReturnType<typeof setTimeout> | null = null
  const callbacks: { fn: (t: Ticker) => void; priority: number }[] = []
  const density = () => window.devicePixelRatio || 1

  function apply(next: Camera) {
    camera.value = next
    fitted.value = isFitted(next, view, sceneSize)
    if (!app) return
    app.stage.scale.set(next.scale)
    app.stage.position.set(next.x, next.y)
    app.render()
    if (textTimer) clearTimeout(textTimer)
    textTimer = setTimeout(() => {
      textTimer = null
      scene?.setTextResolution(Math.min(MAX_TEXT_RESOLUTION, density() * Math.max(1, next.scale)))
      app?.render()
    }, TEXT_SETTLE_MS)
  }

  function resize() {
    const el = host.value
    if (!app || !el) return
    view.width = Math.max(1, el.clientWidth)
    view.height = Math.max(1, el.clientHeight)
    app.renderer.resize(view.width, view.height)
    apply(fitted.value ? fitCamera(view, sceneSize) : clampCamera(camera.value, view, sceneSize))
  }

  onMounted(async () => {
    const el = canvas.value
    if (!el) return
    const created = markRaw(new Application())
    try {
      await created.init({
        canvas: el,
        width: Math.max(1, host.value?.clientWidth ?? layout.width),
        height: Math.max(1, host.value?.clientHeight ?? layout.height),
        background: 0xe6eaee,
        antialias: true,
        preference: 'webgl',
        // Drawn at the screen's own pixel density, so lines and text are sharp on high-density screens.
        autoDensity: true,
        resolution: density(),
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
    scene = markRaw(new PanelScene(layout))
    created.stage.addChild(scene.root)
    const drawn = scene

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
    let lastDrawn = 0
    let drawCost = 0
    let measureNext = false
    callbacks.push({
      fn: (ticker) => {
        // The frame after a draw took about what the draw cost (rasterising included).
        if (measureNext) drawCost = ticker.deltaMS
        measureNext = false
        const changed = drawn.update(frame(ticker.deltaMS))
        const turned = drawn.tick(ticker.deltaMS)
        // A software renderer may take a tenth of a second per frame: then the turning shaft alone is
        // redrawn less often, so the page keeps answering; any other change is still drawn at once.
        const now = performance.now()
        const shaftDue = turned && now - lastDrawn >= (drawCost > SLOW_DRAW_MS ? drawCost * 3 : 0)
        if (changed || shaftDue || needsRender) {
          needsRender = false
          created.render()
          lastDrawn = now
          measureNext = true
        }
      },
      priority: UPDATE_PRIORITY.NORMAL,
    })
    for (const c of callbacks) created.ticker.add(c.fn, undefined, c.priority)

    if (host.value && typeof ResizeObserver !== 'undefined') {
      observer = new ResizeObserver(resize)
      observer.observe(host.value)
    }
    resize()
    ready.value = true
  })

  onBeforeUnmount(() => {
    disposed = true
    observer?.disconnect()
    observer = null
    if (textTimer) clearTimeout(textTimer)
    if (app) {
      for (const c of callbacks) app.ticker.remove(c.fn)
      app.destroy(true, { children: true, texture: true })
      app = null
      scene = null
    }
    callbacks.length = 0
  })

  /** A point on the canvas (CSS pixels from its top left). */
  function toView(clientX: number, clientY: number): Vec {
    const r = canvas.value?.getBoundingClientRect()
    return r ? { x: clientX - r.left, y: clientY - r.top } : { x: 0, y: 0 }
  }

  /** Client (CSS pixel) coordinates to scene units. */
  function toScenePoint(clientX: number, clientY: number): Vec {
    return toScene(camera.value, toView(clientX, clientY))
  }

  return {
    ready,
    error,
    camera,
    fitted,
    view,
    sceneSize,
    toView,
    toScene: toScenePoint,
    setCamera: (next: Camera) => apply(clampCamera(next, view, sceneSize)),
    fit: () => apply(fitCamera(view, sceneSize)),
  }
}
