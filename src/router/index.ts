import { createRouter, createWebHistory } from 'vue-router'
import { routes } from './routes'
import { decide } from './guard'
import { isChunkLoadError, reloadForFreshChunks } from './stale-chunks'
import { useSessionStore } from '@/stores/session'

const router = createRouter({
  history: createWebHistory(import.meta.env.BASE_URL),
  routes,
  scrollBehavior: (_to, _from, saved) => saved ?? { top: 0 },
})

router.beforeEach(async (to) => {
  const session = useSessionStore()
  await session.restore()
  return decide(to, session.guardState())
})

router.afterEach((to) => {
  document.title = to.meta.title ? `${to.meta.title} · Slipway` : 'Slipway'
})

router.onError((error, to) => {
  if (isChunkLoadError(error)) reloadForFreshChunks(to.fullPath)
})

if (typeof window !== 'undefined') {
  // Vite's own signal that a preloaded chunk is gone.
  window.addEventListener('vite:preloadError', (event) => {
    event.preventDefault()
    reloadForFreshChunks(window.location.pathname + window.location.search)
  })
}

export default router
