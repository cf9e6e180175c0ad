// Form rules built from the shared zod schemas, so the client shows the same messages the server would.
import type { z } from 'zod'

/** A Vuetify rule from one field's schema: true, or the first message. */
export function zodRule(schema: z.ZodType) {
  return (value: unknown): true | string => {
    const result = schema.safeParse(value)
    return result.success || (result.error.issues[0]?.message ?? 'Not valid')
  }
}

/** Messages keyed by dotted path from a failed safeParse (first message per field). */
export function issuesByField(error: z.ZodError): Record<string, string> {
  const out: Record<string, string> = {}
  for (const issue of error.issues) {
    const key = issue.path.join('.')
    if (!(key in out)) out[key] = issue.message
  }
  return out
}

/** Like zodRule, but the schema (and zod) is loaded the first time the rule runs. */
export function lazyZodRule(load: () => Promise<z.ZodType>) {
  let rule: ((value: unknown) => true | string) | null = null
  return async (value: unknown): Promise<true | string> => {
    rule ??= zodRule(await load())
    return rule(value)
  }
}
