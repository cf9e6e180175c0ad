// Where a watch stream's batch of events goes in the log a watcher holds: events it already has are skipped
// (a reconnect may send them again), a batch that starts past the end means something was missed.
import type { AttemptEvent } from '@shared/model/events'

export type Placement = { kind: 'append'; events: AttemptEvent[] } | { kind: 'gap' }

export function placeBatch(held: number, from: number, events: readonly AttemptEvent[]): Placement {
  if (from > held) return { kind: 'gap' }
  return { kind: 'append', events: events.slice(held - from) }
}
