// Splits plain text into text and http(s) links, so an outbox message's links can be followed.
export interface TextPart {
  text: string
  href?: string
}

export function linkParts(text: string): TextPart[] {
  const parts: TextPart[] = []
  const re = /https?:\/\/[^\s<>"')]+/g
  let last = 0
  for (const m of text.matchAll(re)) {
    const at = m.index ?? 0
    if (at > last) parts.push({ text: text.slice(last, at) })
    const url = m[0].replace(/[.,;:]+$/, '')
    parts.push({ text: url, href: url })
    last = at + url.length
  }
  if (last < text.length) parts.push({ text: text.slice(last) })
  return parts
}
