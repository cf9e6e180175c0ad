// The live classroom in words: who is watching, how a panel is connected, how long it has been open.
import type { LiveConnection, LiveStatus } from '@shared/api/live'

export function watchingWords(names: readonly string[]): string {
  if (names.length === 0) return ''
  if (names.length === 1) return `${names[0]} is watching`
  const last = names[names.length - 1]
  return `${names.slice(0, -1).join(', ')} and ${last} are watching`
}

export const CONNECTION_WORDS: Record<LiveConnection, string> = {
  active: 'Working',
  idle: 'Idle',
  disconnected: 'Disconnected',
  ended: 'Ended',
}

/** "12 min", "1 h 05 min", "40 s". */
export function elapsedWords(ms: number): string {
  const s = Math.max(0, Math.floor(ms / 1000))
  if (s < 60) return `${s} s`
  const m = Math.floor(s / 60)
  if (m < 60) return `${m} min`
  return `${Math.floor(m / 60)} h ${String(m % 60).padStart(2, '0')} min`
}

export function powerWords(status: LiveStatus): string {
  const locks = [status.ownLock ? 'own lock on' : '', status.supervisorLock ? "supervisor's lock on" : '']
    .filter(Boolean)
    .join(', ')
  return `${status.powerOn ? 'Power on' : 'Power off'}${locks ? `, ${locks}` : ''}`
}

export function driveWords(status: LiveStatus): string {
  return status.outputHz ? `${status.driveState}, ${status.outputHz.toFixed(1)} Hz` : status.driveState
}

/** The connection as the class view says it: "Idle for 3 min", "Disconnected, last seen 1 min ago". */
export function connectionDetail(
  row: { connection: LiveConnection; lastActionAt: string | null; lastSeenAt: string },
  now: number,
): string {
  const since = (iso: string | null) => (iso ? elapsedWords(now - Date.parse(iso)) : null)
  switch (row.connection) {
    case 'active':
      return 'Working'
    case 'idle':
      return since(row.lastActionAt) ? `Idle for ${since(row.lastActionAt)}` : 'Idle'
    case 'disconnected':
      return `Disconnected, last seen ${since(row.lastSeenAt)} ago`
    case 'ended':
      return 'Ended'
  }
}

export function objectivesWords(status: LiveStatus | null): string {
  return status ? `${status.objectivesMet} of ${status.objectivesTotal}` : '—'
}
