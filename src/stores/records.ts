// Records: the commissioning record of an attempt (JSON for the print view, PDF), an apprentice's training
// record (JSON, PDF), a cohort's records as a zip, and an instructor's sign-off of an outcome (and its
// withdrawal).
import { defineStore } from 'pinia'
import {
  commissioningRecordSchema,
  outcomeSignOffSchema,
  trainingRecordSummarySchema,
  withdrawnSignOffSchema,
  type SignOffRequest,
  type SignOffWithdrawalRequest,
} from '@shared/api'
import { downloadFile, request } from '@/api/client'
import { endpoints } from '@/api/endpoints'

export const useRecordsStore = defineStore('records', () => {
  const commissioning = (attemptId: string) =>
    request(endpoints.records.commissioning(attemptId), commissioningRecordSchema)

  const downloadCommissioning = (attemptId: string) =>
    downloadFile(endpoints.records.commissioningPdf(attemptId), 'commissioning-record.pdf')

  const training = (apprenticeId: string, cohortId?: string) =>
    request(endpoints.records.training(apprenticeId), trainingRecordSummarySchema, { query: { cohortId } })

  const downloadTraining = (apprenticeId: string, fileName: string, cohortId?: string) =>
    downloadFile(endpoints.records.trainingPdf(apprenticeId), fileName, { query: { cohortId } })

  const downloadCohort = (cohortId: string, fileName: string) =>
    downloadFile(endpoints.records.cohortZip(cohortId), fileName)

  const signOff = (apprenticeId: string, body: SignOffRequest) =>
    request(endpoints.records.signOffs(apprenticeId), outcomeSignOffSchema, { method: 'POST', body })

  const withdrawSignOff = (signOffId: string, body: SignOffWithdrawalRequest) =>
    request(endpoints.records.signOffWithdrawal(signOffId), withdrawnSignOffSchema, { method: 'POST', body })

  return {
    commissioning,
    downloadCommissioning,
    training,
    downloadTraining,
    downloadCohort,
    signOff,
    withdrawSignOff,
  }
})
