// The Pixi panel as a lazy component: the panel and Pixi load in their own chunk, with the route.
import { defineAsyncComponent } from 'vue'

export const SimulatorPanel = defineAsyncComponent({
  loader: () => import('./components/SimulatorPanel.vue'),
  timeout: 30_000,
})

export type SimulatorMode = 'practice' | 'assignment' | 'replay'
