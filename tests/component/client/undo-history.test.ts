// The form editor's undo: a burst of changes is one step; undo and redo walk the steps; a new change after
// an undo drops what could have been redone; the shortcut leaves text fields to their own undo.
import { afterEach, beforeEach, describe, expect, it, vi } from 'vitest'
import { nextTick, ref } from 'vue'
import { undoShortcut, useUndoHistory } from '@/components/scenarios/editor/undoHistory'

interface Doc {
  title: string
  devices: string[]
}

async function change(doc: { value: Doc | null }, edit: (d: Doc) => void) {
  edit(doc.value!)
  await nextTick()
}

describe('the editor’s undo history', () => {
  beforeEach(() => vi.useFakeTimers())
  afterEach(() => vi.useRealTimers())

  it('makes one step of changes close together, and walks back and forth through the steps', async () => {
    const doc = ref<Doc | null>({ title: 'Fan', devices: ['Run'] })
    const history = useUndoHistory(doc, { settleMs: 500 })
    await nextTick()
    expect(history.canUndo.value).toBe(false)
    // Typing "Fan 2" a letter at a time: one step.
    await change(doc, (d) => (d.title = 'Fan '))
    await change(doc, (d) => (d.title = 'Fan 2'))
    vi.advanceTimersByTime(600)
    // Removing a device, later: a second step.
    await change(doc, (d) => d.devices.pop())
    vi.advanceTimersByTime(600)

    history.undo()
    await nextTick()
    expect(doc.value).toEqual({ title: 'Fan 2', devices: ['Run'] })
    history.undo()
    await nextTick()
    expect(doc.value).toEqual({ title: 'Fan', devices: ['Run'] })
    expect(history.canUndo.value).toBe(false)
    history.redo()
    await nextTick()
    expect(doc.value).toEqual({ title: 'Fan 2', devices: ['Run'] })
    expect(history.canRedo.value).toBe(true)
    // A new change drops what could have been redone.
    await change(doc, (d) => (d.title = 'Fan 3'))
    expect(history.canRedo.value).toBe(false)
  })

  it('starts afresh when reset (a document loaded again)', async () => {
    const doc = ref<Doc | null>({ title: 'Fan', devices: [] })
    const history = useUndoHistory(doc)
    await nextTick()
    await change(doc, (d) => (d.title = 'Pump'))
    expect(history.canUndo.value).toBe(true)
    history.reset()
    expect(history.canUndo.value).toBe(false)
    history.undo()
    expect(doc.value!.title).toBe('Pump')
  })

  it('answers Ctrl+Z and Ctrl+Shift+Z outside text fields only', async () => {
    const calls: string[] = []
    const handler = undoShortcut({
      canUndo: ref(true),
      canRedo: ref(true),
      undo: () => calls.push('undo'),
      redo: () => calls.push('redo'),
      reset: () => {},
    })
    const press = (target: HTMLElement, init: KeyboardEventInit) => {
      const event = new KeyboardEvent('keydown', { bubbles: true, cancelable: true, ...init })
      Object.defineProperty(event, 'target', { value: target })
      handler(event)
      return event.defaultPrevented
    }
    const button = document.createElement('button')
    const input = document.createElement('input')
    expect(press(button, { key: 'z', ctrlKey: true })).toBe(true)
    expect(press(button, { key: 'Z', ctrlKey: true, shiftKey: true })).toBe(true)
    expect(press(button, { key: 'y', metaKey: true })).toBe(true)
    expect(press(input, { key: 'z', ctrlKey: true })).toBe(false)
    expect(press(button, { key: 'z' })).toBe(false)
    expect(calls).toEqual(['undo', 'redo', 'redo'])
  })
})
