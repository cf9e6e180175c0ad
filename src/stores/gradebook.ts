// The gradebook of one cohort: the server pages, sorts and filters; this store keeps the query.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import { gradebookSchema, type Gradebook, type GradebookQuery } from '@shared/api'
import { downloadFile, request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useGradebookStore = defineStore('gradebook', () => {
  const data = ref<Gradebook | null>(null)
  const loading = ref(false)
  const error = ref<unknown>(null)
  let generation = 0

  async function load(cohortId: string, query: GradebookQuery) {
    const mine = ++generation
    loading.value = true
    error.value = null
    try {
      const result = await request(endpoints.cohorts.gradebook(cohortId), gradebookSchema, {
        query: query as Record<string, string | number>,
      })
      if (mine === generation) data.value = result
    } catch (e) {
      if (mine === generation) error.value = e
    } finally {
      if (mine === generation) loading.value = false
    }
  }

  /** The export in the query's sort and filter (none: every apprentice), without paging; the server names the file. */
  async function exportCsv(cohortId: string, query: GradebookQuery) {
    const { page: _page, pageSize: _size, ...rest } = query
    const defined = Object.fromEntries(Object.entries(rest).filter(([, v]) => v !== undefined))
    return downloadFile(endpoints.cohorts.gradebookCsv(cohortId), null, {
      query: defined as Record<string, string | number>,
    })
  }

  return { data, loading, error, load, exportCsv }
})
