// What the replay shows beside the panel, from the graded log: the timeline's marks in plain words, and
// each objective at the playhead — met (from the moment it was met), not met yet, or missed once the
// attempt has ended without it.
import type { AttemptEvent } from '@shared/model/events'
import type { Timeline } from '@shared/model/types'
import type { GradeResult } from '@shared/scenario/grade'
import type { Scenario } from '@shared/scenario/schema'
import { eventWireId, eventWords, injectionWords } from '../scene/eventWords'
import type { PanelLayout } from '../scene/types'
import { wireLabel } from '../scene/wireColours'
import type { ObjectiveTick } from './PanelTaskPanel.vue'

export interface TimelineMark {
  t: number
  /** `injection`: a fault an instructor put in; `message`: a hint or message from an instructor. */
  kind: 'event' | 'violation' | 'objective' | 'injection' | 'message'
  label: string
}

/** Who the replay is for: the apprentice's own replay never names an injected fault; an instructor's does. */
export type ReplayAudience = 'apprentice' | 'instructor'

function eventMark(
  event: AttemptEvent,
  layout: PanelLayout,
  marker: string | undefined,
  audience: ReplayAudience,
): TimelineMark {
  if (event.type === 'fault.injected') {
    const label =
      audience === 'instructor' ? injectionWords(event, layout, marker) : eventWords(event, layout, marker)
    return { t: event.t, kind: 'injection', label }
  }
  const kind = event.type === 'message.received' ? 'message' : 'event'
  return { t: event.t, kind, label: eventWords(event, layout, marker) }
}

/** The marker the panel showed on an event's wire: where the wire stood just after it was added, or before it went. */
function markerOf(event: AttemptEvent, index: number, timeline: Timeline): string | undefined {
  const id = eventWireId(event)
  if (id === undefined) return undefined
  const wires = timeline.segments[event.type === 'wire.added' ? index + 1 : index]?.state.wires ?? []
  const at = wires.findIndex((w) => w.id === id)
  return at >= 0 ? wireLabel(wires[at].id, wires[at].colour, at) : undefined
}

export function replayMarks(
  events: readonly AttemptEvent[],
  timeline: Timeline,
  graded: GradeResult | null,
  layout: PanelLayout,
  audience: ReplayAudience = 'apprentice',
): TimelineMark[] {
  return [
    ...events.map((e, i) => eventMark(e, layout, markerOf(e, i, timeline), audience)),
    ...(graded?.safetyViolations ?? []).map((v) => ({ t: v.t, kind: 'violation' as const, label: v.text })),
    ...(graded?.objectives ?? [])
      .filter((o) => o.met && o.at !== undefined)
      .map((o) => ({ t: o.at as number, kind: 'objective' as const, label: `Objective met: ${o.title}` })),
  ].sort((a, b) => a.t - b.t)
}

/**
 * Objectives at `position`. `attemptEnd` is the last event's time: an objective met with no moment of its
 * own counts from there, and one never met is missed from there on.
 */
export function objectivesAt(
  scenario: Scenario,
  graded: GradeResult | null,
  position: number,
  attemptEnd: number,
): ObjectiveTick[] {
  // A fault an instructor put in brings its objectives at the moment it went in.
  const injected = (graded?.objectives ?? []).filter((o) => o.injection && position >= o.injection.at)
  const own = scenario.objectives.map((o) => ({ ...o, required: !!o.required }))
  return [...own, ...injected].map((o) => {
    const r = graded?.objectives.find((x) => x.id === o.id)
    const metAt = r?.met ? (r.at ?? attemptEnd) : null
    const state =
      metAt !== null && position >= metAt
        ? 'met'
        : position >= attemptEnd && metAt === null
          ? 'missed'
          : 'open'
    return {
      id: o.id,
      title: o.title,
      required: o.required,
      state,
      evidence: state === 'open' ? undefined : r?.evidence,
      points: r?.injection ? r.pointsPossible : undefined,
    }
  })
}
