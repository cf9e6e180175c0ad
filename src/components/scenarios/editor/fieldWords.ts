// Small wording helpers for field messages.

/** A missing or wrong choice reads "Choose a setting", not "Missing: fill this in". */
export function choiceMessages(messages: string[], what: string): string[] {
  return messages.map((m) =>
    /^(Missing|Fill this in|Choose one of|Not one of|Not a terminal|Invalid|Must be)/.test(m)
      ? `Choose ${what}`
      : m,
  )
}
