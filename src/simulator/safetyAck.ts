// Remembers (per browser) that the simulator's safety notice was read and acknowledged.
export const SAFETY_ACK_KEY = 'slipway.safetyAcknowledged.v1'

export function safetyAcknowledged(): boolean {
  return localStorage.getItem(SAFETY_ACK_KEY) !== null
}

export function acknowledgeSafety(now = new Date()) {
  localStorage.setItem(SAFETY_ACK_KEY, now.toISOString())
}
