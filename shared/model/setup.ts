// The starting state of a simulation (from a scenario), as zod schemas with the inferred types.
import { z } from 'zod'
import { DEVICE_KINDS } from './points'
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

export const deviceSpecSchema = z
  .object({
    id: idSchema.refine((id) => id !== 'drive' && id !== 'meter', 'this id is reserved'),
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
])
export type InjectedFault = z.infer<typeof injectedFaultSchema>

export const machineLoadSchema = z.object({
  /** Time constant of the coast-down with the output off (exponential decay of speed). */
  coastSeconds: z.number().positive().max(600).optional(),
  /** Shortest decel ramp (0 → max speed) the load tolerates; faster trips on bus overvoltage. */
  minDecelSeconds: z.number().min(0).max(600).optional(),
})
export type MachineLoad = z.infer<typeof machineLoadSchema>

export const simulationSetupSchema = z.object({
  devices: z.array(deviceSpecSchema).max(32),
  wires: z.array(wireSpecSchema).max(200),
  settings: z.partialRecord(z.enum(SETTING_KEYS), z.union([z.number(), z.string(), z.boolean()])),
  power: z.object({ on: z.boolean(), locked: z.boolean() }),
  faults: z.array(injectedFaultSchema).max(32),
  machine: machineLoadSchema.optional(),
  /** Incoming line voltage (line to line, RMS); default 400 V. */
  lineVolts: z.number().min(100).max(690).optional(),
})
export type SimulationSetup = z.infer<typeof simulationSetupSchema>
