// The keypad menu: browse settings by group, edit within range, save with OK.
import { describe, expect, it } from 'vitest'
import { DEFAULT_SETTINGS, SETTING_GROUPS, settingDef } from '@shared/model/settings'
import {
  locateSetting,
  menuLines,
  pressKey,
  STATUS_SCREEN,
  type KeypadMenu,
} from '@/simulator/scene/keypadMenu'
import type { KeypadKey } from '@/simulator/scene/types'

const values = { active: DEFAULT_SETTINGS, pending: {} }

function press(menu: KeypadMenu, keys: KeypadKey[]) {
  let m = menu
  const output = []
  for (const k of keys) {
    const r = pressKey(m, k, values)
    m = r.menu
    output.push(...r.output)
  }
  return { menu: m, output }
}

describe('the keypad menu', () => {
  it('opens the settings groups from the status screen and goes back', () => {
    expect(press(STATUS_SCREEN, ['enter']).menu).toEqual({ screen: 'groups', group: 0 })
    expect(press(STATUS_SCREEN, ['enter', 'back']).menu).toEqual(STATUS_SCREEN)
  })

  it('wraps around the groups', () => {
    expect(press(STATUS_SCREEN, ['enter', 'up']).menu).toEqual({
      screen: 'groups',
      group: SETTING_GROUPS.length - 1,
    })
  })

  it('edits a number in steps, clamped to the catalogue range, and saves with OK', () => {
    const where = locateSetting('ramp.accelSeconds')!
    const editing: KeypadMenu = { screen: 'edit', ...where, value: 599.9 }
    const r = press(editing, ['up', 'up', 'enter'])
    expect(r.output).toEqual([
      { type: 'setting.changed', key: 'ramp.accelSeconds', value: 600 },
      { type: 'settings.saved' },
    ])
  })

  it('steps ten times faster with left and right, without floating-point dust', () => {
    const where = locateSetting('ramp.accelSeconds')!
    const r = press({ screen: 'edit', ...where, value: 5 }, ['right', 'down', 'enter'])
    expect(r.output[0]).toEqual({ type: 'setting.changed', key: 'ramp.accelSeconds', value: 5.9 })
  })

  it('cycles through the options of a choice', () => {
    const where = locateSetting('reference.remoteSource')!
    const def = settingDef('reference.remoteSource')
    const start = press(STATUS_SCREEN, [])
    expect(start.output).toEqual([])
    const r = press({ screen: 'settings', ...where }, ['enter', 'down', 'enter'])
    if (def.kind !== 'choice') throw new Error('expected a choice')
    const i = def.options.findIndex((o) => o.value === DEFAULT_SETTINGS['reference.remoteSource'])
    expect(r.output[0]).toMatchObject({
      key: 'reference.remoteSource',
      value: def.options[(i + 1) % def.options.length].value,
    })
  })

  it('leaves the menu alone for run, stop and reset (they act on the drive)', () => {
    const menu: KeypadMenu = { screen: 'groups', group: 2 }
    for (const k of ['run', 'stop', 'reset'] as const) expect(pressKey(menu, k, values).menu).toBe(menu)
  })

  it('discards an edit with BACK', () => {
    const where = locateSetting('speed.max')!
    const r = press({ screen: 'settings', ...where }, ['enter', 'up', 'back'])
    expect(r.output).toEqual([])
    expect(r.menu).toEqual({ screen: 'settings', ...where })
  })

  it('shows the setting, its value and its range while editing, in at most 24 characters a line', () => {
    const where = locateSetting('speed.max')!
    const lines = menuLines({ screen: 'edit', ...where, value: 60 }, values)
    expect(lines.join('\n')).toContain('60 Hz')
    expect(lines.join('\n')).toContain('1–120 Hz')
    for (const l of lines) expect(l.length).toBeLessThanOrEqual(24)
  })
})
