// Saves only append: the rule that a draft's new log must begin with every action the server holds.
import { isLogPrefix } from '@shared/api/attempts'

/**
 * True when the stored log (JSON text) opens the new one. Both texts are what the shared log schema's
 * output serialises to (a grading thread writes the new one, the row kept the old one), so the same events
 * are the same characters and a text comparison decides without parsing megabytes on the event loop. A
 * text that differs (a diverged copy, or a row written some other way) is compared event by event.
 */
export function storedLogOpens(storedJson: string, nextJson: string): boolean {
  if (storedJson === '[]') return true
  const open = storedJson.slice(0, -1) // the stored array without its closing bracket
  if (nextJson.startsWith(open)) {
    const after = nextJson[open.length]
    if (after === ',' || after === ']') return true
  }
  return isLogPrefix(JSON.parse(storedJson) as object[], JSON.parse(nextJson) as object[])
}
