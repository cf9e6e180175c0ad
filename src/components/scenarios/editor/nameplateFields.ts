// The motor nameplate's form: its fields read from the model's own schema (labels, units and choices in
// words here), and the plate of the bench motor a scenario gets when it declares none.
import { nameplateFromSettings } from '@shared/model/nameplate'
import { DEFAULT_SETTINGS, validateSetting, type SettingValues } from '@shared/model/settings'
import { motorNameplateSchema, type MotorNameplate } from '@shared/model/setup'
import { NAMEPLATE_FIELD_WORDS } from '@shared/scenario/problemWords'
import { schemaFields, type FieldDescription } from './schemaFields'

/** Every value a nameplate choice can take, in words (duty types IEC 60034-1, classes IEC 60085). */
export const NAMEPLATE_CHOICE_WORDS: Record<string, string> = {
  '50': '50 Hz',
  '60': '60 Hz',
  kW: 'kilowatts (kW)',
  hp: 'horsepower (hp)',
  star: 'Star (Y)',
  delta: 'Delta (Δ)',
  S1: 'S1 (continuous)',
  S2: 'S2 (short-time)',
  S3: 'S3 (intermittent periodic)',
  S4: 'S4 (intermittent, with starting)',
  S5: 'S5 (intermittent, with electric braking)',
  S6: 'S6 (continuous, periodic load)',
  S7: 'S7 (continuous, with electric braking)',
  S8: 'S8 (continuous, load and speed changes)',
  S9: 'S9 (non-periodic load and speed)',
  S10: 'S10 (discrete constant loads)',
  B: 'Class B (130 °C)',
  F: 'Class F (155 °C)',
  H: 'Class H (180 °C)',
}

/** The unit printed beside each number, as the plate and the checker's messages print it (the rated output's is the plate's own). */
const UNITS: Partial<Record<keyof MotorNameplate, string>> = {
  ratedVolts: 'V',
  fullLoadAmps: 'A',
  efficiencyPercent: '%',
  ratedRpm: 'rpm',
}

export const NAMEPLATE_FIELDS: FieldDescription[] = schemaFields('motor', motorNameplateSchema, {
  labels: NAMEPLATE_FIELD_WORDS,
  choices: NAMEPLATE_CHOICE_WORDS,
}).fields

export function nameplateUnit(key: string, plate: Partial<MotorNameplate> | undefined): string {
  if (key === 'ratedPower') return plate?.powerUnit ?? ''
  return UNITS[key as keyof MotorNameplate] ?? ''
}

/** The drive settings at the start: the catalogue's defaults with the scenario's valid changes over them. */
export function startingSettings(changed: Record<string, unknown>): SettingValues {
  const merged: Record<string, unknown> = { ...DEFAULT_SETTINGS }
  for (const [key, value] of Object.entries(changed)) {
    const check = validateSetting(key, value)
    if (check.ok) merged[key] = check.value
  }
  return merged as SettingValues
}

/** The bench motor's plate, as the model builds it from the drive's motor settings at the start. */
export function benchNameplate(changed: Record<string, unknown>): MotorNameplate {
  return nameplateFromSettings(startingSettings(changed))
}

/** One line about a plate, as an instructor reads it: "400 V star, 50 Hz, 2.2 kW, 4.6 A, 1450 rpm". */
export function nameplateSummary(plate: MotorNameplate): string {
  const connection = plate.connection === 'delta' ? 'delta' : 'star'
  return `${plate.ratedVolts} V ${connection}, ${plate.ratedHz} Hz, ${plate.ratedPower} ${plate.powerUnit}, ${plate.fullLoadAmps} A, ${plate.ratedRpm} rpm`
}
