// Remembers (per browser) that the simulator's safety notice was read and acknowledged.
import { browserStorage } from '@/composables/browserStorage'
export const SAFETY_ACK_KEY = 'slipway.safetyAcknowledged.v1'

export function safetyAcknowledged(): boolean {
  return browserStorage('localStorage').getItem(SAFETY_ACK_KEY) !== null
}

export function acknowledgeSafety(now = new Date()) {
  browserStorage('localStorage').setItem(SAFETY_ACK_KEY, now.toISOString())
}
