// Which problem shows on which field: every field knows its place in the document (a path of keys);
// a problem shows there once the author has touched that field, or after a save attempt.
import { computed, inject, provide, reactive, ref, type ComputedRef, type InjectionKey, type Ref } from 'vue'
import { jsonPath } from '@shared/scenario/check'
import type { ScenarioProblem } from '@shared/scenario'

export type FieldPath = readonly (string | number)[]

export interface ProblemContext {
  /** The messages for a field (and anything inside it), once touched; [] before. */
  messagesAt(path: FieldPath): string[]
  /** The messages about a list or section as a whole (not the items inside it), on a save attempt. */
  messagesOn(path: FieldPath): string[]
  touch(path: FieldPath): void
  /** Show every problem at once (after a save attempt). */
  showAll: Ref<boolean>
  touchedCount: ComputedRef<number>
}

const KEY: InjectionKey<ProblemContext> = Symbol('scenario-problems')

/** True when `problemPath` is the field's own path or a place inside it. */
function within(problemPath: string, fieldPath: string) {
  return (
    problemPath === fieldPath ||
    problemPath.startsWith(`${fieldPath}.`) ||
    problemPath.startsWith(`${fieldPath}[`)
  )
}

export function provideProblems(problems: Ref<ScenarioProblem[]>): ProblemContext {
  const touched = reactive(new Set<string>())
  const showAll = ref(false)
  const context: ProblemContext = {
    messagesAt(path) {
      const at = jsonPath(path)
      if (!showAll.value && ![...touched].some((t) => within(t, at) || within(at, t))) return []
      return [...new Set(problems.value.filter((p) => within(p.path, at)).map((p) => p.message))]
    },
    messagesOn(path) {
      const at = jsonPath(path)
      if (!showAll.value && !touched.has(at)) return []
      return [...new Set(problems.value.filter((p) => p.path === at).map((p) => p.message))]
    },
    touch(path) {
      touched.add(jsonPath(path))
    },
    showAll,
    touchedCount: computed(() => touched.size),
  }
  provide(KEY, context)
  return context
}

export function useProblems(): ProblemContext {
  const context = inject(KEY)
  if (!context) throw new Error('useProblems outside the scenario editor')
  return context
}
