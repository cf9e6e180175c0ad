// The instructor's needs-attention list (stateless: views hold the state with useAsync).
import { defineStore } from 'pinia'
import { attentionSchema } from '@shared/api'
import { request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useAttentionStore = defineStore('attention', () => {
  const load = () => request(endpoints.attention, attentionSchema)
  return { load }
})
