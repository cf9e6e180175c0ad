// Gradebooks kept in memory between requests. Building one reads every attempt standing of the cohort
// (milliseconds at 100 apprentices × 8 assignments); an instructor pages, sorts and filters the same data
// again and again. Each cohort's entry is tagged with the cohort's gradebookRevision, which database
// triggers bump on every change a gradebook shows (migration 1764900000000), and the revision is read with
// the cohort row on every request — so a cached gradebook is never served after a change, whichever
// instance made it. Entries are dropped least-recently-used first.
import { createHash } from 'node:crypto'
import { LRUCache } from 'lru-cache'
import type { DataSource } from 'typeorm'
import type { GradebookRow } from '@shared/api/gradebook'
import type { CohortRow } from '../entities'
import { presentGradebookPage } from './gradebook.presenter'
import { loadGradebook, viewGradebook, type CohortGradebook, type GradebookFilter } from './gradebook.service'

export interface GradebookCacheOptions {
  /** Cohorts kept (default 200). */
  maxCohorts?: number
  /** Filtered and sorted views kept per cohort (default 16). */
  maxViewsPerCohort?: number
  /** Serialised pages kept per cohort (default 64). */
  maxPagesPerCohort?: number
}

export type GradebookPageQuery = GradebookFilter & { page: number; pageSize: number }

/** A page of the gradebook as the route sends it: JSON bytes and their entity tag. */
export interface GradebookPageBody {
  json: Buffer
  etag: string
}

interface Entry {
  revision: number
  /** Shared by concurrent first requests, so a burst builds the gradebook once. */
  gradebook: Promise<CohortGradebook>
  views: LRUCache<string, GradebookRow[]>
  pages: LRUCache<string, GradebookPageBody>
}

export interface GradebookView {
  assignments: CohortGradebook['assignments']
  rows: GradebookRow[]
}

export interface GradebookCache {
  /** The cohort's gradebook filtered and sorted, from memory when the cohort's revision has not moved. */
  view(cohort: CohortRow, filter: GradebookFilter): Promise<GradebookView>
  /**
   * One page as JSON (the Gradebook response schema), serialised once per revision and query: a page of
   * 50 apprentices × 8 assignments is ~70 KB, and serialising it again would cost more than the lookup.
   */
  page(cohort: CohortRow, query: GradebookPageQuery): Promise<GradebookPageBody>
  /** How many times a gradebook was built from the database (for tests and benchmarks). */
  readonly loads: number
}

const viewKey = (f: GradebookFilter) => JSON.stringify([f.sort, f.order, f.q, f.status, f.assignmentId])

export function createGradebookCache(ds: DataSource, options: GradebookCacheOptions = {}): GradebookCache {
  const entries = new LRUCache<string, Entry>({ max: options.maxCohorts ?? 200 })
  let loads = 0

  function entryFor(cohort: CohortRow): Entry {
    const revision = cohort.gradebookRevision ?? 0
    const cached = entries.get(cohort.id)
    // A different revision (higher, or lower after a restore from backup) means the data moved on.
    if (cached && cached.revision === revision) return cached
    loads++
    const entry: Entry = {
      revision,
      gradebook: loadGradebook(ds, cohort),
      views: new LRUCache({ max: options.maxViewsPerCohort ?? 16 }),
      pages: new LRUCache({ max: options.maxPagesPerCohort ?? 64 }),
    }
    // A failed load must not stay cached: the next request tries again.
    entry.gradebook.catch(() => {
      if (entries.get(cohort.id) === entry) entries.delete(cohort.id)
    })
    entries.set(cohort.id, entry)
    return entry
  }

  async function viewOf(entry: Entry, filter: GradebookFilter): Promise<GradebookView> {
    const gradebook = await entry.gradebook
    const key = viewKey(filter)
    let rows = entry.views.get(key)
    if (!rows) {
      rows = viewGradebook(gradebook, filter)
      entry.views.set(key, rows)
    }
    return { assignments: gradebook.assignments, rows }
  }

  return {
    view: (cohort, filter) => viewOf(entryFor(cohort), filter),
    async page(cohort, query) {
      const entry = entryFor(cohort)
      const key = `${viewKey(query)}|${query.page}|${query.pageSize}`
      const cached = entry.pages.get(key)
      if (cached) return cached
      const view = await viewOf(entry, query)
      const json = Buffer.from(
        JSON.stringify(presentGradebookPage(cohort.id, view, query.page, query.pageSize)),
      )
      const body = { json, etag: `"${createHash('sha1').update(json).digest('base64url')}"` }
      entry.pages.set(key, body)
      return body
    },
    get loads() {
      return loads
    },
  }
}
