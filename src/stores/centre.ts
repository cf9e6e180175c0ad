// The centre's settings (name, time zone): loaded once signed in; every date on screen uses the zone.
import { ref } from 'vue'
import { defineStore } from 'pinia'
import { centreSettingsSchema, type CentreSettings, type UpdateCentreSettingsRequest } from '@shared/api'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'
import { setDisplayTimeZone } from '@/composables/format'

export const useCentreStore = defineStore('centre', () => {
  const settings = ref<CentreSettings | null>(null)

  function adopt(next: CentreSettings) {
    settings.value = next
    setDisplayTimeZone(next.timeZone)
  }

  async function load() {
    adopt(await request(endpoints.centre, centreSettingsSchema))
  }

  async function update(body: UpdateCentreSettingsRequest) {
    adopt(await request(endpoints.centre, centreSettingsSchema, { method: 'PATCH', body }))
    return settings.value!
  }

  return { settings, load, update }
})
