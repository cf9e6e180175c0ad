// The meter's selector positions (a file of its own: the event schema and the meter both need them).

/**
 * Off; V AC (true RMS of the AC part, DC blocked); V DC (the average); resistance; continuity (resistance
 * on a low range with a tone below a threshold). See meter.ts for the behaviour of each.
 */
export const METER_MODES = ['off', 'acVolts', 'dcVolts', 'resistance', 'continuity'] as const
export type MeterMode = (typeof METER_MODES)[number]

/** Plain words for each position, as printed around the selector. */
export const METER_MODE_LABELS: Record<MeterMode, string> = {
  off: 'Off',
  acVolts: 'V AC',
  dcVolts: 'V DC',
  resistance: 'Resistance (Ω)',
  continuity: 'Continuity',
}

/** The same on the meter's small keys (and the panel's buttons), where the long words do not fit. */
export const METER_MODE_KEY_LABELS: Record<MeterMode, string> = {
  off: 'Off',
  acVolts: 'V AC',
  dcVolts: 'V DC',
  resistance: 'Ω',
  continuity: 'Cont.',
}
