// Undo and redo for the form editor: the whole document is kept as JSON after each burst of changes (typing
// in a field is one step, not one per key), so a removed device or objective can be brought back.
import { computed, getCurrentInstance, onBeforeUnmount, ref, watch, type Ref } from 'vue'

export interface UndoHistory {
  canUndo: Ref<boolean>
  canRedo: Ref<boolean>
  undo(): void
  redo(): void
  /** Forget every step (a document loaded afresh starts a new history). */
  reset(): void
}

export interface UndoOptions {
  /** Changes closer together than this make one step. */
  settleMs?: number
  /** Steps kept; the oldest go first. */
  limit?: number
}

export function useUndoHistory<T extends object>(doc: Ref<T | null>, options: UndoOptions = {}): UndoHistory {
  const settleMs = options.settleMs ?? 700
  const limit = options.limit ?? 100
  const past = ref<string[]>([])
  const future = ref<string[]>([])
  /** The document as last seen. */
  let now: string | null = doc.value ? JSON.stringify(doc.value) : null
  /** True while changes still join the step that is being made. */
  let stepOpen = false
  let timer: ReturnType<typeof setTimeout> | undefined

  function closeStep() {
    stepOpen = false
    clearTimeout(timer)
  }

  watch(
    () => (doc.value ? JSON.stringify(doc.value) : null),
    (json) => {
      if (json === null) return
      if (now === null) {
        now = json
        return
      }
      if (json === now) return
      if (!stepOpen) {
        past.value = [...past.value, now].slice(-limit)
        future.value = []
        stepOpen = true
      }
      now = json
      clearTimeout(timer)
      timer = setTimeout(closeStep, settleMs)
    },
  )

  /** Undo and redo alike: back to the newest kept state of `from`, keeping the present on `to`. */
  function step(from: Ref<string[]>, to: Ref<string[]>) {
    const target = from.value.at(-1)
    if (target === undefined || now === null) return
    closeStep()
    to.value = [...to.value, now]
    from.value = from.value.slice(0, -1)
    now = target
    doc.value = JSON.parse(target) as T
  }

  if (getCurrentInstance()) onBeforeUnmount(() => clearTimeout(timer))

  return {
    canUndo: computed(() => past.value.length > 0),
    canRedo: computed(() => future.value.length > 0),
    undo: () => step(past, future),
    redo: () => step(future, past),
    reset() {
      closeStep()
      past.value = []
      future.value = []
      now = doc.value ? JSON.stringify(doc.value) : null
    },
  }
}

/** Ctrl/⌘+Z and Ctrl/⌘+Shift+Z (or Ctrl+Y) outside text fields, which keep their own undo for typing. */
export function undoShortcut(history: UndoHistory) {
  return (event: KeyboardEvent) => {
    if (!(event.ctrlKey || event.metaKey) || event.altKey) return
    const target = event.target as HTMLElement | null
    if (target?.closest('input, textarea, [contenteditable="true"]')) return
    const key = event.key.toLowerCase()
    if (key === 'z' && !event.shiftKey) history.undo()
    else if ((key === 'z' && event.shiftKey) || key === 'y') history.redo()
    else return
    event.preventDefault()
  }
}
