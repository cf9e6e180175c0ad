// When a failed request is worth sending again, and how long to wait before each try.

/** A client mistake (4xx other than timeout / too many requests) will not get better by retrying. */
export function isRetryable(error: unknown): boolean {
  const status = (error as { status?: number } | null)?.status ?? 0
  if (status === 0) return true
  if (status === 408 || status === 429) return true
  return status >= 500
}

/** 1 s, 2 s, 4 s … capped at 30 s, after the n-th failed try (1-based). */
export function retryDelayMs(tries: number): number {
  return Math.min(30_000, 1000 * 2 ** Math.max(0, tries - 1))
}
