// The settings catalogue as the editor's pickers offer it: labels and groups, never keys.
import { SETTINGS, SETTING_GROUPS, isSettingKey, settingDef, type SettingDef } from '@shared/model/settings'

const GROUP_LABEL = Object.fromEntries(SETTING_GROUPS.map((g) => [g.id, g.label])) as Record<string, string>

export const SETTING_CHOICES = SETTINGS.map((s) => ({
  value: s.key as string,
  title: s.label,
  subtitle: GROUP_LABEL[s.group] ?? '',
}))

export function settingDefOf(key: unknown): SettingDef | undefined {
  return typeof key === 'string' && isSettingKey(key) ? settingDef(key) : undefined
}

/** What the value field says about the allowed values: "5–60 Hz, in steps of 0.5". */
export function settingRangeWords(def: SettingDef | undefined): string {
  if (!def || def.kind !== 'number') return ''
  const unit = def.unit ? ` ${def.unit}` : ''
  return `${def.min}–${def.max}${unit}, in steps of ${def.step}${unit}`
}

/** The value a setting starts at when a form picks it. */
export function settingDefault(key: unknown): string | number | boolean | undefined {
  return settingDefOf(key)?.default
}
