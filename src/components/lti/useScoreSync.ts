// The state of grades sent back to a learning platform, for the gradebook's cells. Read from its own route
// each time the gradebook loads (it is not part of the cached gradebook), so it is never stale by a revision.
import { computed, ref, watch, type Ref } from 'vue'
import type { ScoreSyncCell, ScoreSyncList } from '@shared/api'
import { useLtiStore } from '@/stores/lti'

export function useScoreSync(cohortId: Ref<string | null>, reloadOn: Ref<unknown>) {
  const lti = useLtiStore()
  const list = ref<ScoreSyncList | null>(null)
  const busy = ref(false)
  const error = ref<unknown>(null)

  async function load() {
    if (!cohortId.value) return
    try {
      list.value = await lti.scoreSync(cohortId.value)
    } catch {
      list.value = null // the gradebook itself shows any problem reaching the server
    }
  }
  watch([cohortId, reloadOn], load, { immediate: true })

  const byCell = computed(
    () => new Map((list.value?.cells ?? []).map((c) => [`${c.assignmentId}:${c.userId}`, c])),
  )
  const linked = computed(() => new Set(list.value?.linkedAssignmentIds ?? []))
  const failed = computed(() => (list.value?.cells ?? []).filter((c) => c.state === 'failed').length)

  async function retry() {
    if (!cohortId.value) return
    busy.value = true
    error.value = null
    try {
      list.value = await lti.retryScores(cohortId.value)
    } catch (e) {
      error.value = e
    } finally {
      busy.value = false
    }
  }

  return {
    cellOf: (assignmentId: string, userId: string): ScoreSyncCell | undefined =>
      byCell.value.get(`${assignmentId}:${userId}`),
    isLinked: (assignmentId: string) => linked.value.has(assignmentId),
    failed,
    busy,
    error,
    retry,
    reload: load,
  }
}
