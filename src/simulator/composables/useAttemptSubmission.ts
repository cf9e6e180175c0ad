// Submits an attempt and keeps retrying with the same attempt id until the server acknowledges it.
// The server treats a repeated id as the same attempt, so a retry never creates a second one.
import { ref, onScopeDispose } from 'vue'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'

export type SubmissionStatus = 'idle' | 'sending' | 'waiting' | 'done' | 'refused'

export interface SubmissionOptions {
  send: (body: SubmitAttemptRequest) => Promise<AttemptSummary>
  /** Delay before retry n (1-based); defaults to 1 s, 2 s, 4 s … capped at 30 s. */
  delayMs?: (attempt: number) => number
}

/** A client mistake (4xx other than timeout / too many requests) will not get better by retrying. */
export function isRetryable(error: unknown): boolean {
  const status = (error as { status?: number } | null)?.status ?? 0
  if (status === 0) return true
  if (status === 408 || status === 429) return true
  return status >= 500
}

export function useAttemptSubmission(options: SubmissionOptions) {
  const status = ref<SubmissionStatus>('idle')
  const result = ref<AttemptSummary | null>(null)
  const lastError = ref<string | null>(null)
  const tries = ref(0)
  const delay = options.delayMs ?? ((n: number) => Math.min(30_000, 1000 * 2 ** (n - 1)))
  let timer: ReturnType<typeof setTimeout> | null = null
  let stopped = false

  async function attempt(body: SubmitAttemptRequest): Promise<void> {
    if (stopped) return
    tries.value++
    status.value = 'sending'
    try {
      result.value = await options.send(body)
      status.value = 'done'
      lastError.value = null
    } catch (error) {
      lastError.value = (error as Error)?.message ?? String(error)
      if (!isRetryable(error)) {
        status.value = 'refused'
        return
      }
      status.value = 'waiting'
      await new Promise<void>((resolve) => {
        timer = setTimeout(resolve, delay(tries.value))
      })
      return attempt(body)
    }
  }

  function submit(body: SubmitAttemptRequest): Promise<void> {
    if (status.value === 'sending' || status.value === 'waiting') return Promise.resolve()
    tries.value = 0
    stopped = false
    return attempt(body)
  }

  function cancel() {
    stopped = true
    if (timer) clearTimeout(timer)
    if (status.value === 'waiting') status.value = 'idle'
  }
  onScopeDispose(cancel)

  return { status, result, lastError, tries, submit, cancel }
}
