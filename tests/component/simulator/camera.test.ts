// The view onto the panel: fit, zoom about a point, pan, pinch, and never losing the panel from view.
import { describe, expect, it } from 'vitest'
import {
  clampCamera,
  fitCamera,
  isFitted,
  MAX_ZOOM,
  panBy,
  pinch,
  toScene,
  zoomAt,
} from '@/simulator/scene/camera'

const scene = { width: 1280, height: 640 }
const view = { width: 1350, height: 652 }

describe('the panel view', () => {
  it('fits the whole panel, centred, as large as the canvas allows', () => {
    const fit = fitCamera(view, scene)
    expect(fit.scale).toBeCloseTo(652 / 640)
    expect(fit.y).toBeCloseTo(0)
    expect(fit.x).toBeCloseTo((1350 - 1280 * fit.scale) / 2)
    expect(isFitted(fit, view, scene)).toBe(true)
  })

  it('zooms about the pointer: the scene point under it stays under it', () => {
    const fit = fitCamera(view, scene)
    const at = { x: 400, y: 300 }
    const before = toScene(fit, at)
    const zoomed = zoomAt(fit, 2, at, view, scene)
    expect(zoomed.scale).toBeCloseTo(fit.scale * 2)
    const after = toScene(zoomed, at)
    expect(after.x).toBeCloseTo(before.x)
    expect(after.y).toBeCloseTo(before.y)
  })

  it('zooms no further out than fit and no further in than four times fit', () => {
    const fit = fitCamera(view, scene)
    expect(zoomAt(fit, 0.1, { x: 0, y: 0 }, view, scene).scale).toBeCloseTo(fit.scale)
    expect(zoomAt(fit, 100, { x: 0, y: 0 }, view, scene).scale).toBeCloseTo(fit.scale * MAX_ZOOM)
  })

  it('pans while zoomed in, but never drags the panel out of view', () => {
    const zoomed = zoomAt(fitCamera(view, scene), 2, { x: 0, y: 0 }, view, scene)
    const moved = panBy(zoomed, -100, -50, view, scene)
    expect(moved.x).toBeCloseTo(zoomed.x - 100)
    const far = panBy(zoomed, 99_999, 99_999, view, scene)
    expect(far.x).toBe(0)
    expect(far.y).toBe(0)
    const other = panBy(zoomed, -99_999, -99_999, view, scene)
    expect(other.x).toBeCloseTo(view.width - scene.width * zoomed.scale)
    // At fit there is nothing to pan.
    expect(panBy(fitCamera(view, scene), 50, 50, view, scene)).toEqual(fitCamera(view, scene))
  })

  it('pinches: two fingers spreading apart zoom about their midpoint', () => {
    const fit = fitCamera(view, scene)
    const before: [{ x: number; y: number }, { x: number; y: number }] = [
      { x: 500, y: 300 },
      { x: 600, y: 300 },
    ]
    const after: typeof before = [
      { x: 450, y: 300 },
      { x: 650, y: 300 },
    ]
    const pinched = pinch(fit, before, after, view, scene)
    expect(pinched.scale).toBeCloseTo(fit.scale * 2)
    expect(toScene(pinched, { x: 550, y: 300 }).x).toBeCloseTo(toScene(fit, { x: 550, y: 300 }).x)
  })

  it('keeps a camera valid after the canvas is resized', () => {
    const small = { width: 390, height: 195 }
    const kept = clampCamera({ scale: 1, x: -2000, y: -2000 }, small, scene)
    expect(kept.x).toBeCloseTo(small.width - scene.width)
    expect(kept.y).toBeCloseTo(small.height - scene.height)
  })
})
