// Names of things as the panel shows them, for every text a person reads.
import { POINT_LABELS } from '../model'
import type { ProbePair } from './proofs'
import type { Sample } from './samples'

export function pointLabel(point: string): string {
  return (POINT_LABELS as Record<string, string>)[point] ?? point
}

export function pairLabel(pair: ProbePair): string {
  return `${pointLabel(pair[0])}–${pointLabel(pair[1])}`
}

/** The terminal work a sample is the moment before, in words. */
export function describeWork(before: Sample): string {
  const event = before.event
  switch (event?.type) {
    case 'wire.added':
      return `Wire ${event.id} added (${pointLabel(event.from)} to ${pointLabel(event.to)})`
    case 'wire.removed':
      return `Wire ${event.id} removed`
    case 'device.contactFitted':
      return `Contact block fitted to ${event.device}`
    case 'fuse.replaced':
      return 'Control fuse replaced'
    default:
      return `${event?.type}`
  }
}
