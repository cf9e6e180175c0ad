// The network side of the simulator's machines: what `loadStart`, `saveProgress`, `submitAttempt`,
// `loadServerCopy` and `loadReplay` do in the app (tests give the machines their own).
import { fromPromise } from 'xstate'
import type { AttemptDetail, AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import { DEFAULT_ASSISTANCE_LEVEL } from '@shared/scenario/assistance'
import { useAssignmentsStore } from '@/stores/assignments'
import { useAttemptsStore } from '@/stores/attempts'
import { useScenariosStore } from '@/stores/scenarios'
import { usePracticeStore } from '@/stores/practice'
import type { AttemptCopy } from './machines/attemptStart'
import { liveGradingActor } from './machines/liveGrading'
import type { LiveStart, LiveTarget } from './machines/liveAttemptMachine'
import type { ReplaySource } from './machines/replayMachine'
import { attemptStorageKey, createAttemptStore } from './storage/attemptStore'

function serverCopy(detail: AttemptDetail): AttemptCopy {
  return {
    source: 'server',
    attemptId: detail.id,
    events: detail.events,
    savedAt: detail.updatedAt,
    assistance: detail.assistanceLevel,
  }
}

/** Call inside a component's setup (Pinia stores). */
export function liveAttemptActors() {
  const attempts = useAttemptsStore()
  const scenarios = useScenariosStore()
  const assignments = useAssignmentsStore()
  const practice = usePracticeStore()

  /** The newest attempt in progress for this exercise on the server (another computer may have made it). */
  async function newestInProgress(
    target: LiveTarget,
    scenarioVersionId: string,
  ): Promise<AttemptCopy | null> {
    if (target.attemptId) {
      const asked = await attempts.get(target.attemptId)
      if (asked.status === 'inProgress') return serverCopy(asked)
    }
    const page = await attempts.page({
      status: 'inProgress',
      pageSize: 5,
      ...(target.assignmentId ? { assignmentId: target.assignmentId } : { scenarioId: scenarioVersionId }),
    })
    const newest = page.items.find((a) => (target.assignmentId ? true : a.assignmentId === null))
    return newest ? serverCopy(await attempts.get(newest.id)) : null
  }

  return {
    loadStart: fromPromise<LiveStart, { target: LiveTarget }>(async ({ input: { target } }) => {
      const assignment = target.assignmentId ? await assignments.get(target.assignmentId) : null
      // Free practice an instructor has closed stops here, in the server's words, before any work is done.
      if (target.mode === 'practice') await practice.check(target.scenarioKey)
      const detail = assignment
        ? await scenarios.getVersion(assignment.scenarioKey, assignment.scenarioVersion)
        : target.scenarioVersion
          ? await scenarios.getVersion(target.scenarioKey, target.scenarioVersion)
          : await scenarios.get(target.scenarioKey)
      const store = createAttemptStore(attemptStorageKey(detail.id, target.assignmentId))
      const local = store.load()
      const server = await newestInProgress(target, detail.id)
      return {
        scenario: detail.document,
        scenarioTitle: detail.title,
        scenarioVersionId: detail.id,
        assignment: assignment
          ? {
              title: assignment.title,
              attemptLimit: assignment.attemptLimit,
              attemptsUsed: assignment.myProgress?.attemptsUsed ?? 0,
              hintsAllowed: assignment.hintsAllowed,
            }
          : null,
        assistance:
          server?.assistance ?? assignment?.assistanceLevel ?? target.assistance ?? DEFAULT_ASSISTANCE_LEVEL,
        store,
        browser: local.copy ? { source: 'browser', ...local.copy } : null,
        server,
        problem: local.problem,
      }
    }),
    loadServerCopy: fromPromise<AttemptCopy, { attemptId: string }>(async ({ input }) =>
      serverCopy(await attempts.get(input.attemptId)),
    ),
    saveProgress: fromPromise<AttemptSummary, SubmitAttemptRequest>(({ input }) => attempts.submit(input)),
    submitAttempt: fromPromise<AttemptSummary, SubmitAttemptRequest>(({ input }) => attempts.submit(input)),
    liveGrading: liveGradingActor(),
  }
}

export function replayActors() {
  const attempts = useAttemptsStore()
  const scenarios = useScenariosStore()
  return {
    loadReplay: fromPromise<ReplaySource, { attemptId: string }>(async ({ input }) => {
      const attempt = await attempts.get(input.attemptId)
      const version = await scenarios.getById(attempt.scenarioId)
      return { attempt, scenario: version.document }
    }),
  }
}
