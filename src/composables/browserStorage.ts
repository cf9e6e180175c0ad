// Web storage that the browser may refuse: inside a learning platform's frame, a browser that blocks
// third-party cookies (Chromium's default since its third-party cookie phase-out, Safari) throws on any use
// of localStorage and sessionStorage. Slipway then keeps those values in memory for the life of the page,
// so the app still runs (an attempt in progress is still sent to the server; only a reload forgets it).
class MemoryStorage implements Storage {
  private values = new Map<string, string>()
  get length() {
    return this.values.size
  }
  clear() {
    this.values.clear()
  }
  getItem(key: string) {
    return this.values.get(key) ?? null
  }
  key(index: number) {
    return [...this.values.keys()][index] ?? null
  }
  removeItem(key: string) {
    this.values.delete(key)
  }
  setItem(key: string, value: string) {
    this.values.set(key, String(value))
  }
}

const fallback = { localStorage: new MemoryStorage(), sessionStorage: new MemoryStorage() }

/** The browser's storage when it may be used, else this page's memory. */
export function browserStorage(kind: 'localStorage' | 'sessionStorage'): Storage {
  try {
    const storage = globalThis[kind]
    if (!storage) return fallback[kind]
    void storage.length // reading it is what throws when the browser refuses
    return storage
  } catch {
    return fallback[kind]
  }
}
