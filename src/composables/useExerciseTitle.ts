// An exercise named by its title, never by its internal key (the key shows only until the list arrives).
import { computed } from 'vue'
import { useScenariosStore } from '@/stores/scenarios'

export function useExerciseTitle(key: () => string | undefined) {
  const scenarios = useScenariosStore()
  if (!scenarios.items.length) scenarios.load()
  return computed(() => {
    const k = key()
    return scenarios.items.find((s) => s.key === k)?.title ?? k ?? ''
  })
}
