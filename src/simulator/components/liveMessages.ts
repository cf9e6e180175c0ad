// Which messages the live panel shows over its corner, from the machine's context.
import type { LiveAttemptContext } from '../machines/liveAttemptMachine'
import type { PanelMessage } from './PanelMessages.vue'

/** Below this width the panel is small: say so plainly (it still works by touch). */
export const NARROW_SCREEN_PX = 600

export function liveMessages(ctx: LiveAttemptContext, screenWidth: number): PanelMessage[] {
  const messages: PanelMessage[] = ctx.warnings.map((w) => ({
    key: `warning-${w.id}`,
    kind: 'error',
    text: w.text,
  }))
  if (ctx.actionError)
    messages.push({
      key: `refused-${ctx.logLength}-${ctx.actionError}`,
      kind: 'warning',
      text: ctx.actionError,
    })
  ;(ctx.sim?.messages ?? []).forEach((m, i) =>
    messages.push({ key: `model-${ctx.logLength}-${i}-${m.text}`, kind: 'info', text: m.text }),
  )
  if (ctx.notice) messages.push({ key: `notice-${ctx.epoch}-${ctx.notice}`, kind: 'info', text: ctx.notice })
  if (ctx.start?.problem) messages.push({ key: 'stored-copy', kind: 'warning', text: ctx.start.problem })
  if (screenWidth < NARROW_SCREEN_PX) {
    messages.push({
      key: 'narrow-screen',
      kind: 'info',
      sticky: true,
      text: 'This panel is made for a screen at least 768 px wide: use a tablet or a computer, or turn your phone sideways. It still works here: pinch to zoom, tap a terminal and then another to wire.',
    })
  }
  return messages
}
