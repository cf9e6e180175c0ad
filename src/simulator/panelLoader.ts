// The Pixi panel as a lazy component: the panel and Pixi load in their own chunk, with the route.
import { defineAsyncComponent } from 'vue'
import type { LiveTarget } from './machines/liveAttemptMachine'

export const SimulatorPanel = defineAsyncComponent({
  loader: () => import('./components/SimulatorPanel.vue'),
  timeout: 30_000,
})

/** What the route asks the simulator to open: ids only; the simulator's machines load the rest. */
export type SimulatorRequest = { kind: 'replay'; attemptId: string } | { kind: 'live'; target: LiveTarget }

/** Watching a panel live (instructors): the same chunk's renderer, through the replay machine. */
export const WatchPanel = defineAsyncComponent({
  loader: () => import('./components/WatchSession.vue'),
  timeout: 30_000,
})
