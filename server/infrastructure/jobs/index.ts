// The durable job queue: see DEVELOPERS.md ("Background jobs") for the guarantees and how to add a kind.
export { defineJobKind, JobError, retryDelayMs, DEFAULT_RETRY } from './job-kind'
export type { EnqueueOptions, EnqueuedJob, JobKind, JobKindSpec, RetryPolicy } from './job-kind'
export { createJobWorker } from './worker'
export type { HandlerOptions, JobCounts, JobHandler, JobWorker, JobWorkerOptions, RunningJob } from './worker'
export type { Schedule } from './schedule'
export { readJobQueueFigures, retryFailedJob, restartQueuedJob, pruneDoneJobs } from './job-store'
export type { JobKindFigures } from './job-store'
