// The roster preview: every row checked by the shared invitation schema before anything is sent.
import { describe, expect, it } from 'vitest'
import { mergeServerRowErrors, previewRoster, rowProblem } from '@/components/cohorts/roster'

describe('the roster preview', () => {
  it('reads name and e-mail columns in any order and case', () => {
    const preview = previewRoster(
      'Email,Name\nwren.maddox@bench.example,Wren Maddox\nolu.brisk@bench.example,Olu Brisk\n',
    )
    expect(preview.fileErrors).toEqual([])
    expect(preview.rows.map((r) => [r.line, r.name, r.email])).toEqual([
      [2, 'Wren Maddox', 'wren.maddox@bench.example'],
      [3, 'Olu Brisk', 'olu.brisk@bench.example'],
    ])
    expect(preview.validCount).toBe(2)
  })

  it('marks each bad row with the field and the reason, counting lines as the server does', () => {
    const preview = previewRoster(
      'name,email\nWren Maddox,not-an-address\n,olu.brisk@bench.example\nTam Ode,tam.ode@bench.example\n',
    )
    expect(preview.rows[0]).toMatchObject({ line: 2, errors: { email: 'Must be an e-mail address' } })
    expect(preview.rows[1]).toMatchObject({ line: 3, errors: { name: 'Enter a name' } })
    expect(preview.rows[2].errors).toEqual({})
    expect(preview.validCount).toBe(1)
  })

  it('catches the same address twice in one file', () => {
    const preview = previewRoster('name,email\nWren Maddox,wren@bench.example\nWren M.,WREN@bench.example\n')
    expect(preview.rows[1].errors.email).toBe('Same e-mail as line 2')
  })

  it('understands quoted cells with commas (RFC 4180), through csv-parse', () => {
    const preview = previewRoster('name,email\n"Maddox, Wren",wren@bench.example\n')
    expect(preview.rows[0].name).toBe('Maddox, Wren')
    expect(preview.validCount).toBe(1)
  })

  it('refuses a file without the name and email header', () => {
    const preview = previewRoster('wren@bench.example,Wren Maddox\n')
    expect(preview.fileErrors[0]).toMatch(/“name” and “email”/)
    expect(preview.rows).toEqual([])
  })

  it('says so when the file is empty', () => {
    expect(previewRoster('').fileErrors).toEqual(['The file is empty.'])
  })

  it('adds the per-row errors the server sends back when it refuses a file', () => {
    const preview = previewRoster('name,email\nWren Maddox,wren@bench.example\n')
    const merged = mergeServerRowErrors(preview, {
      rows: [{ row: 2, field: 'email', message: 'Already invited' }],
    })
    expect(merged.rows[0].errors).toEqual({ email: 'Already invited' })
    expect(merged.validCount).toBe(0)
  })
})

describe('a row’s problem in words', () => {
  it('names the column as its heading does, never the field behind it', () => {
    expect(rowProblem('email', 'Must be an e-mail address')).toBe('E-mail: Must be an e-mail address')
    expect(rowProblem('name', 'Enter a name')).toBe('Name: Enter a name')
    expect(rowProblem('row', 'Already invited')).toBe('Already invited')
  })
})
