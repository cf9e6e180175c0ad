// The scenario library: list, read, create and version, duplicate, retire, upload a pack.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import {
  scenarioDetailSchema,
  scenarioSummarySchema,
  scenarioListSchema,
  scenarioUploadResultSchema,
  scenarioVersionListSchema,
  SCENARIO_PACK_FIELD,
  type ScenarioDocument,
  type ScenarioLibraryItem,
} from '@shared/api'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useScenariosStore = defineStore('scenarios', () => {
  const items = ref<ScenarioLibraryItem[]>([])
  const loading = ref(false)
  const error = ref<unknown>(null)

  async function load(includeRetired = false) {
    loading.value = true
    error.value = null
    try {
      items.value = (
        await request(endpoints.scenarios.list, scenarioListSchema, {
          query: { includeRetired: String(includeRetired) },
        })
      ).items
    } catch (e) {
      error.value = e
    } finally {
      loading.value = false
    }
  }

  const get = (key: string) => request(endpoints.scenarios.latest(key), scenarioDetailSchema)
  const getVersion = (key: string, version: number) =>
    request(endpoints.scenarios.version(key, version), scenarioDetailSchema)
  const versions = async (key: string) =>
    (await request(endpoints.scenarios.versions(key), scenarioVersionListSchema)).items

  const getById = (id: string) => request(endpoints.scenarios.byId(id), scenarioDetailSchema)
  /** The document's own `id` is the new key. */
  const create = (document: ScenarioDocument) =>
    request(endpoints.scenarios.list, scenarioDetailSchema, { method: 'POST', body: document })
  /** Stores the next version of `key`; the server numbers it. */
  const update = (key: string, document: ScenarioDocument) =>
    request(endpoints.scenarios.latest(key), scenarioDetailSchema, { method: 'PUT', body: document })
  const duplicate = (key: string, newKey: string) =>
    request(endpoints.scenarios.duplicate(key), scenarioDetailSchema, { method: 'POST', body: { newKey } })
  const retire = (key: string) =>
    request(endpoints.scenarios.retire(key), scenarioSummarySchema, { method: 'POST' })
  const restoreScenario = (key: string) =>
    request(endpoints.scenarios.restore(key), scenarioSummarySchema, { method: 'POST' })

  async function upload(file: File) {
    const form = new FormData()
    form.append(SCENARIO_PACK_FIELD, file)
    return (
      await request(endpoints.scenarios.upload, scenarioUploadResultSchema, { method: 'POST', body: form })
    ).items
  }

  return {
    items,
    loading,
    error,
    load,
    get,
    getById,
    getVersion,
    versions,
    create,
    update,
    duplicate,
    retire,
    restoreScenario,
    upload,
  }
})
