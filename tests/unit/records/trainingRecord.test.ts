// The training record of one apprentice, read back from the PDF: each outcome with the attempt and date
// that showed it and its sign-off (or a withdrawn one), every attempt's score, the safety record.
import { describe, expect, it } from 'vitest'
import { trainingRecordPdf, type TrainingRecordView } from '../../../server/records'
import { readPdf } from './pdfText'

const view: TrainingRecordView = {
  centre: { name: 'Kestrel Vale Electrical Training Centre', timeZone: 'Pacific/Auckland' },
  generatedAt: '2026-04-02T03:00:00Z',
  apprentice: { name: 'Nkem Halvorsen' },
  cohorts: ['Spring 2026 drives'],
  instructor: { name: 'Oona Fairbrass' },
  outcomes: [
    {
      outcome: 'Wire a maintained run contact to a digital input in sink logic',
      scenarioTitle: 'Two-wire run/stop for the extract fan',
      // 23:30 UTC on 10 March is 11 March in Auckland (UTC+13 in daylight time; IANA tz database).
      shownBy: { attemptLabel: 'Attempt 3', at: '2026-03-10T23:30:00Z', score: 92 },
      signOff: { by: 'Oona Fairbrass', at: '2026-03-12T01:00:00Z', note: 'Proved dead without prompting.' },
      withdrawn: [],
    },
    {
      outcome: 'Commission a drive: start, raise to a target speed, hold it, lower and stop by ramp',
      scenarioTitle: 'Commission raise/lower speed control on the sawmill infeed',
      shownBy: null,
      signOff: null,
      withdrawn: [
        {
          by: 'Oona Fairbrass',
          at: '2026-03-12T01:00:00Z',
          withdrawnBy: 'Oona Fairbrass',
          withdrawnAt: '2026-03-13T01:00:00Z',
          reason: 'Signed off on the wrong exercise.',
        },
      ],
    },
  ],
  attempts: [
    {
      scenarioTitle: 'Two-wire run/stop for the extract fan',
      attemptLabel: 'Attempt 2',
      submittedAt: '2026-03-09T22:00:00Z',
      score: 55,
      passed: false,
      overridden: true,
      safetyViolations: 1,
    },
    {
      scenarioTitle: 'Two-wire run/stop for the extract fan',
      attemptLabel: 'Attempt 3',
      submittedAt: '2026-03-10T23:30:00Z',
      score: 92,
      passed: true,
      overridden: false,
      safetyViolations: 0,
    },
  ],
  safety: [
    {
      scenarioTitle: 'Two-wire run/stop for the extract fan',
      attemptLabel: 'Attempt 2',
      at: '2026-03-09T22:00:00Z',
      atMs: 12_000,
      text: 'Wire W2 added (+24 to Fan run / stop 13) at 00:12.0 with no lock on the disconnect.',
    },
  ],
}

describe('training record', () => {
  it('shows each outcome with the attempt and date that showed it, and its sign-off', async () => {
    const pdf = await readPdf(await trainingRecordPdf(view))
    expect(pdf.text).toContain('Wire a maintained run contact to a digital input in sink logic')
    expect(pdf.text).toContain('Attempt 3, 11 Mar 2026 92 %')
    expect(pdf.text).toContain('Oona Fairbrass, 12 Mar 2026 Proved dead without prompting.')
    expect(pdf.text).toContain('Not yet shown — Not signed off')
    expect(pdf.text).toContain('1 of 2 shown, 1 signed off, 1 sign-off withdrawn')
    // A withdrawn sign-off stays on the record with who, when and why.
    expect(pdf.text).toContain(
      'Sign-off by Oona Fairbrass (12 Mar 2026) withdrawn by Oona Fairbrass, 13 Mar 2026: Signed off on the wrong exercise.',
    )
    // Scores, with the overridden one marked; the safety record.
    expect(pdf.text).toContain('Attempt 2 10 Mar 2026 55 % * Not passed 1')
    expect(pdf.text).toContain('Score changed by an instructor')
    expect(pdf.text).toContain('1 unsafe act recorded')
    expect(pdf.text).toContain('00:12.0 Wire W2 added (+24 to Fan run / stop 13)')
    expect(pdf.text).toContain('Record made 2 Apr 2026, 16:00 GMT+13')
    expect(pdf.text).toContain('Signatures Apprentice Nkem Halvorsen')
    expect(pdf.rasterImages).toBe(0)
  }, 60_000)

  it('says plainly when there is nothing to show yet', async () => {
    const empty: TrainingRecordView = {
      ...view,
      outcomes: [],
      attempts: [],
      safety: [],
      cohorts: [],
      instructor: null,
    }
    const pdf = await readPdf(await trainingRecordPdf(empty))
    expect(pdf.text).toContain('No learning outcomes yet')
    expect(pdf.text).toContain('No attempts submitted yet')
    expect(pdf.text).toContain('No unsafe acts recorded in 0 submitted attempts')
    expect(pdf.text).toContain('Instructor Not assigned')
  }, 60_000)
})
