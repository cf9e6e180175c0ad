// The panel's keys: hold a device's letter for a momentary button, press it to switch a selector,
// Delete (or Backspace) removes the selected wire. Buttons held by key are released when the window
// loses focus, so none stays pressed.
import { onBeforeUnmount, onMounted } from 'vue'
import type { DeviceState } from '@shared/model/types'
import type { Intent } from '../scene/interaction'
import { typingInField } from '../typing'

export function usePanelKeys(options: {
  hotkeys: () => Record<string, string>
  devices: () => Record<string, Pick<DeviceState, 'spec'>> | null
  selectedWire: () => string | null
  intent: (intent: Intent) => void
}) {
  const heldByKey = new Map<string, string>()

  function onKeydown(e: KeyboardEvent) {
    if (typingInField(e) || e.ctrlKey || e.metaKey || e.altKey) return
    const k = e.key.toLowerCase()
    const wire = options.selectedWire()
    if ((k === 'delete' || k === 'backspace') && wire) {
      e.preventDefault()
      options.intent({ type: 'wire.remove', wire })
      return
    }
    const device = Object.entries(options.hotkeys()).find(([, key]) => key === k)?.[0]
    if (!device || e.repeat) return
    const kind = options.devices()?.[device]?.spec.kind
    if (kind === 'pushbutton') {
      e.preventDefault()
      heldByKey.set(k, device)
      options.intent({ type: 'device.press', device })
    } else if (kind === 'selector') {
      e.preventDefault()
      options.intent({ type: 'device.toggle', device })
    }
  }

  function onKeyup(e: KeyboardEvent) {
    const device = heldByKey.get(e.key.toLowerCase())
    if (!device) return
    heldByKey.delete(e.key.toLowerCase())
    options.intent({ type: 'device.release', device })
  }

  function releaseAll() {
    for (const device of heldByKey.values()) options.intent({ type: 'device.release', device })
    heldByKey.clear()
  }

  onMounted(() => {
    window.addEventListener('keydown', onKeydown)
    window.addEventListener('keyup', onKeyup)
    window.addEventListener('blur', releaseAll)
  })
  onBeforeUnmount(() => {
    window.removeEventListener('keydown', onKeydown)
    window.removeEventListener('keyup', onKeyup)
    window.removeEventListener('blur', releaseAll)
  })
}
