// The view onto the scene: a scale and an offset (canvas pixels), as pure functions. "Fit" shows the
// whole panel centred; zoom keeps the point under the pointer (or between two fingers) where it is; the
// panel is never dragged out of sight.
import type { Vec } from './types'

export interface Camera {
  scale: number
  x: number
  y: number
}

export interface Size {
  width: number
  height: number
}

/** How far past fit one may zoom in. */
export const MAX_ZOOM = 4
/** One +/− step, or one wheel notch. */
export const ZOOM_STEP = 1.25

export function fitScale(view: Size, scene: Size): number {
  return Math.min(view.width / scene.width, view.height / scene.height)
}

export function fitCamera(view: Size, scene: Size): Camera {
  return clampCamera({ scale: fitScale(view, scene), x: 0, y: 0 }, view, scene)
}

/** Centres a scene smaller than the view; otherwise keeps the view inside the scene. */
export function clampCamera(camera: Camera, view: Size, scene: Size): Camera {
  const min = fitScale(view, scene)
  const scale = Math.min(Math.max(camera.scale, min), min * MAX_ZOOM)
  const axis = (offset: number, viewSize: number, sceneSize: number) => {
    const drawn = sceneSize * scale
    if (drawn <= viewSize) return (viewSize - drawn) / 2
    return Math.min(0, Math.max(viewSize - drawn, offset))
  }
  return { scale, x: axis(camera.x, view.width, scene.width), y: axis(camera.y, view.height, scene.height) }
}

/** Zooms by `factor` keeping the view point `at` over the same scene point. */
export function zoomAt(camera: Camera, factor: number, at: Vec, view: Size, scene: Size): Camera {
  const focus = toScene(camera, at)
  const scale = camera.scale * factor
  return clampCamera({ scale, x: at.x - focus.x * scale, y: at.y - focus.y * scale }, view, scene)
}

export function panBy(camera: Camera, dx: number, dy: number, view: Size, scene: Size): Camera {
  return clampCamera({ ...camera, x: camera.x + dx, y: camera.y + dy }, view, scene)
}

/**
 * Two fingers moved from `before` to `after` (view points): the scene point under their midpoint stays
 * under it, and the scale follows the distance between them.
 */
export function pinch(
  camera: Camera,
  before: [Vec, Vec],
  after: [Vec, Vec],
  view: Size,
  scene: Size,
): Camera {
  const mid = (p: [Vec, Vec]) => ({ x: (p[0].x + p[1].x) / 2, y: (p[0].y + p[1].y) / 2 })
  const dist = (p: [Vec, Vec]) => Math.hypot(p[0].x - p[1].x, p[0].y - p[1].y) || 1
  const focus = toScene(camera, mid(before))
  const scale = camera.scale * (dist(after) / dist(before))
  const m = mid(after)
  return clampCamera({ scale, x: m.x - focus.x * scale, y: m.y - focus.y * scale }, view, scene)
}

export function toScene(camera: Camera, p: Vec): Vec {
  return { x: (p.x - camera.x) / camera.scale, y: (p.y - camera.y) / camera.scale }
}

export function isFitted(camera: Camera, view: Size, scene: Size): boolean {
  return Math.abs(camera.scale - fitScale(view, scene)) < 1e-6
}
