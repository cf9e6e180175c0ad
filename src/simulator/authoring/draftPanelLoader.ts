// The draft's panel as a lazy component: it loads with Pixi in its own chunk, like the simulator's.
import { defineAsyncComponent } from 'vue'

export const DraftPanel = defineAsyncComponent({
  loader: () => import('./DraftSession.vue'),
  timeout: 30_000,
})
