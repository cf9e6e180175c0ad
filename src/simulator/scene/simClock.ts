// Simulated time: follows wall time times a speed-up factor, in integer milliseconds.
export interface SimClock {
  /** Simulated time now (integer ms, never going back). */
  time(): number
  readonly speed: number
  setSpeed(speed: number): void
  /** Jump (replay scrubbing); live sessions never call this. */
  set(t: number): void
  pause(): void
  resume(): void
  readonly paused: boolean
}

export function createSimClock(startT = 0, wallNow: () => number = () => performance.now()): SimClock {
  let speed = 1
  let paused = false
  let baseWall = wallNow()
  let baseSim = startT
  let last = startT
  const raw = () => (paused ? baseSim : baseSim + (wallNow() - baseWall) * speed)
  const rebase = () => {
    baseSim = raw()
    baseWall = wallNow()
  }
  return {
    time() {
      last = Math.max(last, Math.floor(raw()))
      return last
    },
    get speed() {
      return speed
    },
    setSpeed(next: number) {
      if (!(next > 0)) throw new Error(`speed must be positive, got ${next}`)
      rebase()
      speed = next
    },
    set(t: number) {
      baseSim = t
      baseWall = wallNow()
      last = Math.floor(t)
    },
    pause() {
      rebase()
      paused = true
    },
    resume() {
      if (!paused) return
      paused = false
      baseWall = wallNow()
    },
    get paused() {
      return paused
    },
  }
}
