// Finds the Pixi panel component lazily. import.meta.glob keeps the build working before the panel
// file exists (it then matches nothing) and still puts the panel and Pixi in their own chunk.
import { defineAsyncComponent, type Component } from 'vue'

const found = import.meta.glob<{ default: Component }>('../panel/SimulatorPanel.vue')
const load = Object.values(found)[0]

export const SimulatorPanel: Component | null = load
  ? defineAsyncComponent({ loader: () => load().then((m) => m.default), timeout: 30_000 })
  : null

export type SimulatorMode = 'practice' | 'assignment' | 'replay'
