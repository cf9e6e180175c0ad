// The locks on the disconnect and what their tags say, in words (the canvas draws the same tags).
import type { LockTag, SupervisorLock } from '@shared/model/setup'

export function locksInWords(power: {
  locked: boolean
  tag?: LockTag | null
  supervisorLock?: SupervisorLock | null
}): string {
  const locks: string[] = []
  if (power.supervisorLock) locks.push(`${power.supervisorLock.name}'s lock, tagged with their name`)
  if (power.locked) {
    locks.push(
      power.tag
        ? `your lock, tagged ${power.tag.name}, ${power.tag.date}`
        : 'your lock (no tag details recorded)',
    )
  }
  if (locks.length === 0) return 'No lock on the disconnect.'
  return `On the disconnect: ${locks.join('; ')}.`
}
