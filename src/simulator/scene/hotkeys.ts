// Keyboard letters for the field devices: hold the letter for a momentary button, press it to
// switch a selector. Letters come from the device labels so they are easy to remember.
import type { PanelDevice } from './types'

/** Keys the panel already uses for itself. */
const RESERVED = new Set(['delete', 'escape'])

export function deviceHotkeys(devices: readonly PanelDevice[]): Record<string, string> {
  const taken = new Set<string>()
  const keys: Record<string, string> = {}
  for (const d of devices) {
    if (d.kind === 'potentiometer') continue
    const letters = d.label.toLowerCase().replace(/[^a-z]/g, '')
    const pick = [...letters].find((c) => !taken.has(c) && !RESERVED.has(c))
    const key = pick ?? [...'123456789'].find((c) => !taken.has(c))
    if (!key) continue
    taken.add(key)
    keys[d.id] = key
  }
  return keys
}
