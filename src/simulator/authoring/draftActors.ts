// The live-attempt machine's effects for a draft on the panel: the start is the draft already loaded and
// checked by the page; no copy is kept in the browser; nothing is ever sent as an attempt. Setting up the
// start is not graded (no objectives, no safety warnings); trying the draft and its reference run are.
import { fromCallback, fromPromise } from 'xstate'
import type { AttemptSummary, SubmitAttemptRequest } from '@shared/api/attempts'
import type { AssistanceLevel } from '@shared/scenario/assistance'
import type { Scenario } from '@shared/scenario/schema'
import type { AttemptCopy } from '../machines/attemptStart'
import type { DraftPurpose, LiveStart, LiveTarget } from '../machines/liveAttemptMachine'
import {
  liveGradingActor,
  type FromLiveGrading,
  type LiveGradingInput,
  type ToLiveGrading,
} from '../machines/liveGrading'
import type { AttemptStore } from '../storage/attemptStore'

/** A run on a draft keeps no copy anywhere: closing the page ends it. */
export const NO_STORE: AttemptStore = {
  load: () => ({ copy: null, problem: null }),
  append: () => {},
  clear: () => {},
}

const neverSent = (what: string) =>
  fromPromise<AttemptSummary, SubmitAttemptRequest>(async () => {
    throw new Error(`A run on a draft is never ${what}.`)
  })

export interface DraftRunStart {
  scenario: Scenario
  title: string
  purpose: DraftPurpose
  assistance: AssistanceLevel
}

export function draftRunTarget(key: string, purpose: DraftPurpose, assistance: AssistanceLevel): LiveTarget {
  return { mode: 'draft', draftPurpose: purpose, scenarioKey: key, assistance }
}

export function draftRunActors(run: DraftRunStart) {
  return {
    loadStart: fromPromise<LiveStart, { target: LiveTarget }>(async () => ({
      scenario: run.scenario,
      scenarioTitle: run.title,
      scenarioVersionId: 'draft',
      assignment: null,
      assistance: run.assistance,
      store: NO_STORE,
      browser: null,
      server: null,
      problem: null,
    })),
    loadServerCopy: fromPromise<AttemptCopy, { attemptId: string }>(async () => {
      throw new Error('A run on a draft has no copy on the server.')
    }),
    saveProgress: neverSent('saved as an attempt'),
    submitAttempt: neverSent('submitted as an attempt'),
    liveGrading:
      run.purpose === 'setup'
        ? fromCallback<ToLiveGrading, LiveGradingInput, FromLiveGrading>(() => () => {})
        : liveGradingActor(),
  }
}
