// The in-process grade sender behind enqueueScorePost: one post per apprentice and assignment at a time,
// retried with backoff, restarted when a newer grade arrives meanwhile.
import { describe, expect, it } from 'vitest'
import { createInProcessScoreQueue, type ScorePostOutcome } from '../../../server/lti/score-queue'

const post = { assignmentId: 'a1', userId: 'u1' }

describe('in-process score queue', () => {
  it('retries a post the platform did not take, then stops after the last delay', async () => {
    const tries: { number: number; last: boolean }[] = []
    const queue = createInProcessScoreQueue(
      async (_post, attempt) => {
        tries.push(attempt)
        return 'retry'
      },
      { retryDelaysMs: [5, 5] },
    )
    queue.enqueueScorePost(post)
    await queue.idle()
    expect(tries).toEqual([
      { number: 1, last: false },
      { number: 2, last: false },
      { number: 3, last: true },
    ])
  })

  it('does not double a post already waiting for the same apprentice and assignment', async () => {
    let runs = 0
    const queue = createInProcessScoreQueue(async () => {
      runs++
      return 'done'
    })
    queue.enqueueScorePost(post, { delayMs: 20 })
    queue.enqueueScorePost(post, { delayMs: 20 })
    queue.enqueueScorePost({ ...post, userId: 'u2' }, { delayMs: 20 })
    await queue.idle()
    expect(runs).toBe(2)
  })

  it('sends again when a newer grade arrives while a post is running', async () => {
    let runs = 0
    let release!: () => void
    const queue = createInProcessScoreQueue(async (): Promise<ScorePostOutcome> => {
      runs++
      if (runs === 1) await new Promise<void>((resolve) => (release = resolve))
      return 'done'
    })
    queue.enqueueScorePost(post)
    await new Promise((resolve) => setTimeout(resolve, 10))
    queue.enqueueScorePost(post)
    release()
    await queue.idle()
    expect(runs).toBe(2)
  })

  it('counts a handler that throws as a try to repeat', async () => {
    const errors: unknown[] = []
    let runs = 0
    const queue = createInProcessScoreQueue(
      async () => {
        runs++
        if (runs === 1) throw new Error('database busy')
        return 'done'
      },
      { retryDelaysMs: [5], onError: (e) => errors.push(e) },
    )
    queue.enqueueScorePost(post)
    await queue.idle()
    expect(runs).toBe(2)
    expect(errors).toHaveLength(1)
  })
})
