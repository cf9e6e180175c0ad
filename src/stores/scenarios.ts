// The scenario library: list and read versions; drafts, reference solutions and publishing (authoring);
// duplicate, retire, export and import packs.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import { z } from 'zod'
import {
  packImportResultSchema,
  scenarioDetailSchema,
  scenarioDraftListSchema,
  scenarioDraftSchema,
  scenarioSummarySchema,
  scenarioListSchema,
  scenarioVersionWithReferenceSchema,
  SCENARIO_PACK_FIELD,
  type ScenarioDraftDocument,
  type ScenarioLibraryItem,
} from '@shared/api'
import type { AttemptEvent } from '@shared/model/events'
import { downloadFile, request, requestVoid } from '@/api/client'
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
  /** Every published version, newest first, with how the reference solution fared on each. */
  const versions = async (key: string) =>
    (
      await request(
        endpoints.scenarios.versions(key),
        z.object({ items: z.array(scenarioVersionWithReferenceSchema) }),
      )
    ).items

  const getById = (id: string) => request(endpoints.scenarios.byId(id), scenarioDetailSchema)

  // ---- Drafts (shared/api/scenarioAuthoring.ts has the rules) ----
  const listDrafts = async () =>
    (await request(endpoints.scenarios.drafts, scenarioDraftListSchema)).items
  /** A draft of a brand-new key. */
  const createDraft = (key: string, document: ScenarioDraftDocument) =>
    request(endpoints.scenarios.drafts, scenarioDraftSchema, { method: 'POST', body: { key, document } })
  const getDraft = (key: string) => request(endpoints.scenarios.draft(key), scenarioDraftSchema)
  /** Starts a draft from the latest version (answers with the existing draft when there is one). */
  const startDraft = (key: string) =>
    request(endpoints.scenarios.draft(key), scenarioDraftSchema, { method: 'POST' })
  const saveDraft = (key: string, document: ScenarioDraftDocument) =>
    request(endpoints.scenarios.draft(key), scenarioDraftSchema, { method: 'PUT', body: { document } })
  const discardDraft = (key: string) => requestVoid(endpoints.scenarios.draft(key), { method: 'DELETE' })
  const recordReference = (key: string, events: AttemptEvent[]) =>
    request(endpoints.scenarios.draftReference(key), scenarioDraftSchema, {
      method: 'PUT',
      body: { events },
    })
  /** The draft becomes the key's next version (refused until it passes its checks and its reference run). */
  const publishDraft = (key: string) =>
    request(endpoints.scenarios.draftPublish(key), scenarioDetailSchema, { method: 'POST' })
  /** A draft of `newKey` from the latest version of `key`, with its reference solution. */
  const duplicate = (key: string, newKey: string) =>
    request(endpoints.scenarios.duplicate(key), scenarioDraftSchema, { method: 'POST', body: { newKey } })
  const retire = (key: string) =>
    request(endpoints.scenarios.retire(key), scenarioSummarySchema, { method: 'POST' })
  const restoreScenario = (key: string) =>
    request(endpoints.scenarios.restore(key), scenarioSummarySchema, { method: 'POST' })

  async function upload(file: File) {
    const form = new FormData()
    form.append(SCENARIO_PACK_FIELD, file)
    return (
      await request(endpoints.scenarios.upload, packImportResultSchema, { method: 'POST', body: form })
    ).items
  }
  /** Downloads a pack of the newest published version of each key, with reference solutions. */
  const exportPack = (keys: string[]) =>
    downloadFile(endpoints.scenarios.exportPack, 'slipway-scenarios.json', { query: { keys: keys.join(',') } })

  return {
    items,
    loading,
    error,
    load,
    get,
    getById,
    getVersion,
    versions,
    listDrafts,
    createDraft,
    getDraft,
    startDraft,
    saveDraft,
    discardDraft,
    recordReference,
    publishDraft,
    duplicate,
    retire,
    restoreScenario,
    upload,
    exportPack,
  }
})
