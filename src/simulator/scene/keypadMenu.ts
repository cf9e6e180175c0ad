// The drive keypad's menu as a pure reducer: browse settings by group, edit within range, save.
// Run/stop/reset are drive commands and leave the menu alone.
import {
  SETTINGS,
  SETTING_GROUPS,
  type SettingDef,
  type SettingKey,
  type SettingValue,
  type SettingValues,
} from '@shared/model/settings'
import { readDrive } from '@shared/model/readings'
import type { AttemptEvent } from '@shared/model/events'
import type { SimState } from '@shared/model/types'
import { STATUS_PAGES, type StatusPage } from './driveDisplay'
import type { KeypadKey } from './types'

export type KeypadMenu =
  /** The status display; `page` indexes STATUS_PAGES (▲▼ step through them; absent = the first). */
  | { screen: 'status'; page?: number }
  | { screen: 'groups'; group: number }
  | { screen: 'settings'; group: number; item: number }
  | { screen: 'edit'; group: number; item: number; value: SettingValue }

export const STATUS_SCREEN: KeypadMenu = { screen: 'status' }

/** The keys' names in words (buttons beside the canvas, announcements, the replay's timeline). */
export const KEY_NAMES: Record<KeypadKey, string> = {
  run: 'Run',
  stop: 'Stop',
  reset: 'Reset',
  up: 'Up',
  down: 'Down',
  left: 'Left',
  right: 'Right',
  enter: 'OK',
  back: 'Back',
}

/** Settings that the keypad edits, with the value to show. */
export interface KeypadValues {
  active: SettingValues
  pending: Partial<Record<SettingKey, SettingValue>>
}

/** Model events the keypad asks for besides recording the key itself. */
export type KeypadOutput =
  { type: 'setting.changed'; key: SettingKey; value: SettingValue } | { type: 'settings.saved' }

const GROUP_ITEMS: SettingDef[][] = SETTING_GROUPS.map((g) =>
  (SETTINGS as readonly SettingDef[]).filter((s) => s.group === g.id),
)

function wrap(i: number, n: number) {
  return ((i % n) + n) % n
}

export function currentValue(values: KeypadValues, key: SettingKey): SettingValue {
  return (values.pending[key] ?? values.active[key]) as SettingValue
}

export function settingAt(group: number, item: number): SettingDef {
  return GROUP_ITEMS[group][item]
}

function stepValue(def: SettingDef, value: SettingValue, direction: 1 | -1, coarse: boolean): SettingValue {
  if (def.kind === 'boolean') return !value
  if (def.kind === 'choice') {
    // Options read as a list: down goes to the next one.
    const i = def.options.findIndex((o) => o.value === value)
    return def.options[wrap(i - direction, def.options.length)].value as SettingValue
  }
  const step = coarse ? def.step * 10 : def.step
  const next = Math.min(def.max, Math.max(def.min, Number(value) + direction * step))
  // Round to the step grid so 0.1 + 0.2 never shows as 0.30000000000000004.
  const decimals = Math.max(0, -Math.floor(Math.log10(def.step) + 1e-9))
  return Number(next.toFixed(decimals)) as SettingValue
}

export function pressKey(
  menu: KeypadMenu,
  key: KeypadKey,
  values: KeypadValues,
): { menu: KeypadMenu; output: KeypadOutput[] } {
  const same = { menu, output: [] as KeypadOutput[] }
  if (key === 'run' || key === 'stop' || key === 'reset') return same
  switch (menu.screen) {
    case 'status':
      if (key === 'up' || key === 'down') {
        const page = wrap((menu.page ?? 0) + (key === 'down' ? 1 : -1), STATUS_PAGES.length)
        return { menu: page === 0 ? STATUS_SCREEN : { screen: 'status', page }, output: [] }
      }
      return key === 'enter' || key === 'right' ? { menu: { screen: 'groups', group: 0 }, output: [] } : same
    case 'groups':
      if (key === 'up' || key === 'down') {
        return {
          menu: { ...menu, group: wrap(menu.group + (key === 'down' ? 1 : -1), GROUP_ITEMS.length) },
          output: [],
        }
      }
      if (key === 'enter' || key === 'right')
        return { menu: { screen: 'settings', group: menu.group, item: 0 }, output: [] }
      if (key === 'back' || key === 'left') return { menu: STATUS_SCREEN, output: [] }
      return same
    case 'settings': {
      const n = GROUP_ITEMS[menu.group].length
      if (key === 'up' || key === 'down') {
        return { menu: { ...menu, item: wrap(menu.item + (key === 'down' ? 1 : -1), n) }, output: [] }
      }
      if (key === 'enter' || key === 'right') {
        const def = settingAt(menu.group, menu.item)
        return {
          menu: { ...menu, screen: 'edit', value: currentValue(values, def.key as SettingKey) },
          output: [],
        }
      }
      if (key === 'back' || key === 'left')
        return { menu: { screen: 'groups', group: menu.group }, output: [] }
      return same
    }
    case 'edit': {
      const def = settingAt(menu.group, menu.item)
      if (key === 'up' || key === 'down') {
        return {
          menu: { ...menu, value: stepValue(def, menu.value, key === 'up' ? 1 : -1, false) },
          output: [],
        }
      }
      if (key === 'left' || key === 'right') {
        return {
          menu: { ...menu, value: stepValue(def, menu.value, key === 'right' ? 1 : -1, true) },
          output: [],
        }
      }
      if (key === 'back')
        return { menu: { screen: 'settings', group: menu.group, item: menu.item }, output: [] }
      // OK stores the value and saves it to the drive in one step, as the display says.
      return {
        menu: { screen: 'settings', group: menu.group, item: menu.item },
        output: [
          { type: 'setting.changed', key: def.key as SettingKey, value: menu.value },
          { type: 'settings.saved' },
        ],
      }
    }
  }
}

export function formatSettingValue(def: SettingDef, value: SettingValue): string {
  if (def.kind === 'boolean') return value ? 'Yes' : 'No'
  if (def.kind === 'choice') {
    const label = def.options.find((o) => o.value === value)?.label ?? String(value)
    return label
  }
  return `${value} ${def.unit}`.trim()
}

const WIDTH = 24

function fit(s: string): string {
  return s.length > WIDTH ? `${s.slice(0, WIDTH - 1)}…` : s
}

/** The four lines of the keypad display for a menu screen (the status screen is drawn elsewhere). */
export function menuLines(menu: KeypadMenu, values: KeypadValues): string[] {
  switch (menu.screen) {
    case 'status':
      return []
    case 'groups': {
      const g = SETTING_GROUPS[menu.group]
      return [
        fit(`SETTINGS  ${menu.group + 1}/${SETTING_GROUPS.length}`),
        fit(`> ${g.label}`),
        '',
        fit('▲▼ group  OK open'),
      ]
    }
    case 'settings': {
      const def = settingAt(menu.group, menu.item)
      const value = currentValue(values, def.key as SettingKey)
      return [
        fit(SETTING_GROUPS[menu.group].label),
        fit(`> ${def.label}`),
        fit(`  ${formatSettingValue(def, value)}`),
        fit('▲▼ item  OK edit'),
      ]
    }
    case 'edit': {
      const def = settingAt(menu.group, menu.item)
      const range = def.kind === 'number' ? `${def.min}–${def.max} ${def.unit}` : 'choose'
      return [
        fit(`EDIT ${def.label}`),
        fit(`= ${formatSettingValue(def, menu.value)}`),
        fit(range),
        fit('▲▼ ◀▶×10 OK save'),
      ]
    }
  }
}

/** The status display's page the menu is on (the status screen's ▲▼ pages; the speed page elsewhere). */
export function statusPage(menu: KeypadMenu): StatusPage {
  return menu.screen === 'status' ? STATUS_PAGES[menu.page ?? 0] : 'speed'
}

/** Where the keypad must go to edit a setting: the path the side panel can show as a hint. */
export function locateSetting(key: SettingKey): { group: number; item: number } | null {
  for (let g = 0; g < GROUP_ITEMS.length; g++) {
    const item = GROUP_ITEMS[g].findIndex((s) => s.key === key)
    if (item >= 0) return { group: g, item }
  }
  return null
}

/**
 * The menu after one attempt event, given the model state just after it: a key press moves the menu
 * while the display is lit (and may ask for setting events), and the drive powering up shows the
 * status screen. The live panel and the replay both fold the log through this, so a replay shows the
 * keypad as it was.
 */
export function menuAfterEvent(
  menu: KeypadMenu,
  event: AttemptEvent,
  after: SimState,
): { menu: KeypadMenu; output: KeypadOutput[] } {
  if (event.type === 'power.on') return { menu: STATUS_SCREEN, output: [] }
  if (event.type !== 'keypad.key' || !readDrive(after).displayOn) return { menu, output: [] }
  return pressKey(menu, event.key, { active: after.settings.active, pending: after.settings.pending })
}
