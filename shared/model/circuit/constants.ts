// Electrical figures of the simulated control circuit. Where no published figure exists they are
// typical values for general-purpose drives ("common practice"), chosen to behave realistically.

/** +24 V control supply: open-circuit volts, internal resistance, current limit (common practice). */
export const SUPPLY_VOLTS = 24
export const SUPPLY_OHMS = 0.5
export const SUPPLY_LIMIT_AMPS = 0.2
/** +10 V potentiometer reference and its own current limit (common practice). */
export const REFERENCE_VOLTS = 10
export const REFERENCE_OHMS = 10
export const REFERENCE_LIMIT_AMPS = 0.01
/** Opto-coupled digital input: series resistance and LED forward drop (common practice). */
export const INPUT_OHMS = 4700
export const OPTO_DROP_VOLTS = 1
/**
 * What an ohmmeter reads from a digital input to its common: the input's resistance as it presents at
 * 24 V, R = 24 V / I(24 V) with I = (24 − 1) V / 4.7 kΩ = 4.89 mA — inside IEC 61131-2 type 1's ON
 * current band at 24 V (2–15 mA, so 1.6–12 kΩ). Read the same both ways round (the LED's polarity is
 * not modelled in the ohms ranges).
 */
export const INPUT_OHMS_AT_24V = SUPPLY_VOLTS / ((SUPPLY_VOLTS - OPTO_DROP_VOLTS) / INPUT_OHMS)
/** Analog voltage input resistance to analog common (common practice). */
export const ANALOG_INPUT_OHMS = 20_000
/** A closed contact or a relay contact: a few milliohms (from memory: contact resistance < 50 mΩ). */
export const CONTACT_OHMS = 0.005
/** Smallest resistance at each end of a potentiometer track (common practice). */
export const POT_END_OHMS = 0.5
/** A digital multimeter's input resistance (common practice: 10 MΩ). */
export const METER_OHMS = 10e6
/** Tiny leakage from every net to 0 V so that floating nets solve (they read about 0 V). */
export const LEAKAGE_OHMS = 1e9
