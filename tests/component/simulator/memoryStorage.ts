// A Storage in memory that counts what is written, so tests can see how much each save rewrites.
export class MemoryStorage implements Storage {
  private data = new Map<string, string>()
  /** Characters written by setItem since the last reset. */
  written = 0
  get length() {
    return this.data.size
  }
  clear() {
    this.data.clear()
  }
  getItem(k: string) {
    return this.data.get(k) ?? null
  }
  key(i: number) {
    return [...this.data.keys()][i] ?? null
  }
  removeItem(k: string) {
    this.data.delete(k)
  }
  setItem(k: string, v: string) {
    this.written += v.length
    this.data.set(k, v)
  }
}
