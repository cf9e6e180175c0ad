// What the replay shows beside the panel, from the graded log: the timeline's marks in plain words, and
// each objective at the playhead — met (from the moment it was met), not met yet, or missed once the
// attempt has ended without it.
import type { AttemptEvent } from '@shared/model/events'
import type { Timeline } from '@shared/model/types'
import type { GradeResult } from '@shared/scenario/grade'
import { injectableFaults } from '@shared/scenario/injectable'
import type { Scenario } from '@shared/scenario/schema'
import { eventWireId, eventWords } from '../scene/eventWords'
import type { PanelLayout } from '../scene/types'
import { wireLabel } from '../scene/wireColours'
import type { ObjectiveTick } from './PanelTaskPanel.vue'

export interface TimelineMark {
  t: number
  kind: 'event' | 'violation' | 'objective'
  label: string
}

/** The marker the panel showed on an event's wire: where the wire stood just after it was added, or before it went. */
function markerOf(event: AttemptEvent, index: number, timeline: Timeline): string | undefined {
  const id = eventWireId(event)
  if (id === undefined) return undefined
  const wires = timeline.segments[event.type === 'wire.added' ? index + 1 : index]?.state.wires ?? []
  const at = wires.findIndex((w) => w.id === id)
  return at >= 0 ? wireLabel(wires[at].id, wires[at].colour, at) : undefined
}

/**
 * An instructor's fault in words for the instructors' views: who, and what from the catalogue of the bench
 * just before it (the apprentice's own views say only that something changed, as a real bench would).
 */
function injectionWords(
  event: Extract<AttemptEvent, { type: 'fault.injected' }>,
  before: Timeline['segments'][number],
) {
  const wanted = JSON.stringify(event.fault)
  const label = injectableFaults(before.state).find((o) => JSON.stringify(o.fault) === wanted)?.label
  return `${event.by.name} put in a fault${label ? `: ${label}` : ''}`
}

export function replayMarks(
  events: readonly AttemptEvent[],
  timeline: Timeline,
  graded: GradeResult | null,
  layout: PanelLayout,
  options: { nameInjections?: boolean } = {},
): TimelineMark[] {
  return [
    ...events.map((e, i) => ({
      t: e.t,
      kind: 'event' as const,
      label:
        e.type === 'fault.injected' && options.nameInjections && timeline.segments[i]
          ? injectionWords(e, timeline.segments[i])
          : eventWords(e, layout, markerOf(e, i, timeline)),
    })),
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
  return scenario.objectives.map((o) => {
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
      required: !!o.required,
      state,
      evidence: state === 'open' ? undefined : r?.evidence,
    }
  })
}
