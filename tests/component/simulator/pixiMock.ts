// A stand-in for pixi.js in happy-dom (no WebGL): counts applications, ticker callbacks and
// destroys, so lifecycle tests can see leaks. Scene objects accept any drawing call.
export const pixiState = {
  initialised: 0,
  destroyed: 0,
  callbacks: new Set<unknown>(),
  initDelayMs: 5,
}

export function resetPixiState() {
  pixiState.initialised = 0
  pixiState.destroyed = 0
  pixiState.callbacks.clear()
  pixiState.initDelayMs = 5
}

const vec = () => ({ set() {}, x: 0, y: 0 })

/** Any method call returns the object itself, so chained drawing calls work. */
class Drawable {
  children: unknown[] = []
  position = vec()
  scale = vec()
  anchor = vec()
  pivot = vec()
  rotation = 0
  text = ''
  constructor() {
    return new Proxy(this, {
      get(target, prop, receiver) {
        if (prop in target) return Reflect.get(target, prop, receiver)
        if (prop === 'then' || typeof prop === 'symbol') return undefined
        return () => receiver
      },
    })
  }
  addChild(...c: unknown[]) {
    this.children.push(...c)
    return c[0]
  }
  removeChildren() {
    const c = this.children
    this.children = []
    return c
  }
  destroy() {}
}

export class Container extends Drawable {}
export class Graphics extends Drawable {}
export class Text extends Drawable {
  constructor(options?: { text?: string }) {
    super()
    this.text = options?.text ?? ''
  }
}

export const UPDATE_PRIORITY = { INTERACTION: 50, HIGH: 25, NORMAL: 0, LOW: -25, UTILITY: -50 }

export class Application {
  stage = new Container()
  renderer = { resize() {} }
  render() {}
  ticker = {
    add: (fn: unknown) => pixiState.callbacks.add(fn),
    remove: (fn: unknown) => pixiState.callbacks.delete(fn),
  }
  async init() {
    await new Promise((r) => setTimeout(r, pixiState.initDelayMs))
    pixiState.initialised++
  }
  destroy() {
    pixiState.destroyed++
  }
}
