import { createRouter, createWebHistory } from 'vue-router'
import { routes } from './routes'
import { decide } from './guard'
import { isChunkLoadError, reloadForFreshChunks } from './stale-chunks'
import { useSessionStore } from '@/stores/session'
import { useNotify } from '@/composables/useNotify'

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

// A lazy screen whose chunk is gone after a deploy (Vite's preload errors end up here too, since
// they are rethrown when nobody cancels them) reloads at the page the user was going to.
router.onError((error, to) => {
  if (!isChunkLoadError(error)) return
  // Reloaded a moment ago and still missing: say so instead of reloading in a loop.
  if (!reloadForFreshChunks(to.fullPath)) {
    useNotify().notify('This page could not be loaded. Check the connection, then reload the page.', 'error')
  }
})

export default router
