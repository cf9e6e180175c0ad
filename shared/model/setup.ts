// The starting state of a simulation (from a scenario), as zod schemas with the inferred types.
import { z } from 'zod'
import { DEVICE_KINDS, DIGITAL_INPUT_NUMBERS, MOTOR_TERMINALS, OUTPUT_PHASES } from './points'
import { SETTING_KEYS } from './settings'

export const CONTACT_TYPES = ['NO', 'NC'] as const
export type ContactType = (typeof CONTACT_TYPES)[number]

/** Wire colours offered (IEC 60204-1 13.2 / NFPA 79 13.2 recommend blue for DC control). */
export const WIRE_COLOURS = [
  'blue',
  'whiteBlue',
  'black',
  'red',
  'orange',
  'brown',
  'grey',
  'white',
  'violet',
  'greenYellow',
] as const
export type WireColour = (typeof WIRE_COLOURS)[number]

const idSchema = z
  .string()
  .min(1)
  .max(64)
  .regex(/^[A-Za-z0-9_-]+$/, 'use letters, digits, "-" or "_"')
export const pointIdSchema = z.string().min(1).max(80)

/** Point prefixes the bench itself uses: a field device may not take one as its id. */
export const RESERVED_DEVICE_IDS: readonly string[] = ['drive', 'meter', 'motor', 'prover']

export const deviceSpecSchema = z
  .object({
    id: idSchema.refine((id) => !RESERVED_DEVICE_IDS.includes(id), 'this id is reserved'),
    kind: z.enum(DEVICE_KINDS),
    label: z.string().min(1).max(80),
    contact: z.enum(CONTACT_TYPES).optional(),
    ohms: z.number().positive().max(1e6).optional(),
    position: z.number().min(0).max(1).optional(),
  })
  .superRefine((d, ctx) => {
    if (d.kind !== 'potentiometer' && !d.contact) {
      ctx.addIssue({
        code: 'custom',
        path: ['contact'],
        message: `a ${d.kind} needs a contact type (NO or NC)`,
      })
    }
    if (d.kind === 'selector' && d.position !== undefined && d.position !== 0 && d.position !== 1) {
      ctx.addIssue({ code: 'custom', path: ['position'], message: 'a selector is in position 0 or 1' })
    }
  })
export type DeviceSpec = z.infer<typeof deviceSpecSchema>

export const wireSpecSchema = z.object({
  id: idSchema,
  from: pointIdSchema,
  to: pointIdSchema,
  colour: z.enum(WIRE_COLOURS),
})
export type WireSpec = z.infer<typeof wireSpecSchema>

export const injectedFaultSchema = z.discriminatedUnion('kind', [
  z.object({ kind: z.literal('brokenWire'), wireId: idSchema }),
  z.object({ kind: z.literal('contactFailedOpen'), device: idSchema }),
  z.object({ kind: z.literal('contactWelded'), device: idSchema }),
  z.object({ kind: z.literal('wrongContactType'), device: idSchema }),
  z.object({ kind: z.literal('blownFuse') }),
  /** One conductor of the motor cable broken inside (open from drive terminal to motor terminal). */
  z.object({ kind: z.literal('motorConductorOpen'), conductor: z.enum(OUTPUT_PHASES) }),
  /**
   * A drive input that stops responding (its input stage damaged): the drive reads it OFF whatever its
   * terminal sees. Cleared when its function is moved to a working input (faults.ts says why).
   */
  z.object({ kind: z.literal('inputUnresponsive'), input: z.literal(DIGITAL_INPUT_NUMBERS) }),
  /**
   * A setting changed behind the apprentice's back: the active value becomes `value`, as if keyed in and
   * saved. Cleared when the setting is saved back to the value it had before.
   */
  z.object({
    kind: z.literal('settingChanged'),
    key: z.enum(SETTING_KEYS),
    value: z.union([z.number(), z.string().max(80), z.boolean()]),
  }),
])
export type InjectedFault = z.infer<typeof injectedFaultSchema>

/**
 * How the driven machine's torque depends on speed (common practice): a fan or centrifugal pump is a
 * variable-torque load (torque rises with the square of speed), a conveyor or feeder a constant-torque load.
 */
export const LOAD_KINDS = ['variableTorque', 'constantTorque'] as const
export type LoadKind = (typeof LOAD_KINDS)[number]

export const machineLoadSchema = z.object({
  /** Time constant of the coast-down with the output off (exponential decay of speed). */
  coastSeconds: z.number().positive().max(600).optional(),
  /** Shortest decel ramp (0 → max speed) the load tolerates; faster trips on bus overvoltage. */
  minDecelSeconds: z.number().min(0).max(600).optional(),
  loadKind: z.enum(LOAD_KINDS).optional(),
  /** Torque the machine needs at the motor's rated speed, as a fraction of the motor's rated torque. */
  loadFraction: z.number().min(0).max(1.5).optional(),
})
export type MachineLoad = z.infer<typeof machineLoadSchema>

/** IEC 60034-1 duty types S1 (continuous) … S10. */
export const DUTY_TYPES = ['S1', 'S2', 'S3', 'S4', 'S5', 'S6', 'S7', 'S8', 'S9', 'S10'] as const

/**
 * A motor's rating plate, as printed on the motor (the drive's motor settings are what the apprentice
 * keys in from it). The figures must agree with each other: see `nameplateProblems`.
 */
export const motorNameplateSchema = z.object({
  /** Our own invented serial; each motor on the bench has its own. */
  serial: z.string().min(1).max(32),
  /** Line-to-line voltage for the connection used. */
  ratedVolts: z.number().min(100).max(690),
  ratedHz: z.union([z.literal(50), z.literal(60)]),
  /** Rated output (shaft power) in `powerUnit`. */
  ratedPower: z.number().positive().max(500),
  powerUnit: z.enum(['kW', 'hp']),
  /** Full-load current at rated voltage, A. */
  fullLoadAmps: z.number().positive().max(1000),
  /** cos φ at full load. */
  powerFactor: z.number().min(0.3).max(1),
  /** Full-load efficiency, %. */
  efficiencyPercent: z.number().min(30).max(99.5),
  /** Winding connection for the rated voltage: star (Y) or delta (Δ). */
  connection: z.enum(['star', 'delta']),
  /** Full-load speed, rpm (below synchronous speed by the slip). */
  ratedRpm: z.number().min(100).max(3600),
  duty: z.enum(DUTY_TYPES),
  /** Insulation thermal class (IEC 60085), e.g. F. */
  insulationClass: z.enum(['B', 'F', 'H']).optional(),
})
export type MotorNameplate = z.infer<typeof motorNameplateSchema>

/**
 * The motor cable: where each conductor from the drive's U, V, W lands in the motor's terminal box
 * (null: not landed). Default straight through (U → U1, V → V1, W → W1). Two conductors may not share
 * a terminal. A swapped pair turns the motor the other way; an unlanded conductor leaves a phase open.
 */
const landing = z.enum(MOTOR_TERMINALS).nullable()
export type MotorCable = {
  u: z.infer<typeof landing>
  v: z.infer<typeof landing>
  w: z.infer<typeof landing>
}

/** Two conductors may not share a motor terminal. */
export function cableLandsOnce(cable: MotorCable): boolean {
  const landed = [cable.u, cable.v, cable.w].filter((t) => t !== null)
  return new Set(landed).size === landed.length
}
const CABLE_MESSAGE = 'two conductors cannot land on one motor terminal'

export const motorCableSchema = z
  .object({ u: landing, v: landing, w: landing })
  .refine(cableLandsOnce, CABLE_MESSAGE)
/** The same, refusing unknown keys (scenario files are strict). */
export const strictMotorCableSchema = z
  .strictObject({ u: landing, v: landing, w: landing })
  .refine(cableLandsOnce, CABLE_MESSAGE)

/** A lock (with its tag) that someone in the scenario's story put on the disconnect. */
export const supervisorLockSchema = z.object({
  /** The name on the tag, as the story gives it (an invented person). */
  name: z.string().trim().min(1).max(80),
})
export type SupervisorLock = z.infer<typeof supervisorLockSchema>

/** What the apprentice writes on their own tag: their name and the date (ISO, YYYY-MM-DD). */
export const lockTagSchema = z.object({
  name: z.string().trim().min(1).max(80),
  date: z.iso.date(),
})
export type LockTag = z.infer<typeof lockTagSchema>

export const simulationSetupSchema = z.object({
  devices: z.array(deviceSpecSchema).max(32),
  wires: z.array(wireSpecSchema).max(200),
  settings: z.partialRecord(z.enum(SETTING_KEYS), z.union([z.number(), z.string(), z.boolean()])),
  power: z.object({
    on: z.boolean(),
    /** The apprentice's own lock is on the disconnect. */
    locked: z.boolean(),
    /** Someone else's lock in the story (a supervisor who isolated it): only they remove it. */
    supervisorLock: supervisorLockSchema.optional(),
  }),
  faults: z.array(injectedFaultSchema).max(32),
  machine: machineLoadSchema.optional(),
  /** Incoming line voltage (line to line, RMS); default 400 V. */
  lineVolts: z.number().min(100).max(690).optional(),
  /** The motor's nameplate; default: a bench motor that matches the drive's motor settings. */
  motor: motorNameplateSchema.optional(),
  /** How the motor cable is landed at the start; default straight through. */
  motorCable: motorCableSchema.optional(),
})
export type SimulationSetup = z.infer<typeof simulationSetupSchema>
