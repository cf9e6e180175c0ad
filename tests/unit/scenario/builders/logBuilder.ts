// Builds attempt event logs by acting on a live model, the way an apprentice at the panel would:
// each event is applied as it is recorded, so a script can wait "until the bus is below 40 V".
import {
  advance,
  applyEvent,
  createSimulation,
  readCircuit,
  readDrive,
  type AttemptEvent,
  type CircuitReading,
  type DiagnosisFinding,
  type DiagnosisTarget,
  type DriveReading,
  type KeypadKey,
  type MeterMode,
  type SettingKey,
  type SettingValue,
  type SimState,
  type SimulationSetup,
  type WireColour,
} from '@shared/model'

/** An event without its time: the builder stamps the current time. */
type Untimed<E> = E extends AttemptEvent ? Omit<E, 't'> : never
export type EventBody = Untimed<AttemptEvent>

export class LogBuilder {
  readonly events: AttemptEvent[] = []
  private state: SimState

  constructor(setup: SimulationSetup) {
    this.state = createSimulation(setup)
  }

  get t(): number {
    return this.state.t
  }

  get drive(): DriveReading {
    return readDrive(this.state)
  }

  get circuit(): CircuitReading {
    return readCircuit(this.state)
  }

  /** What the drive would read after an event, without recording it. */
  peek(body: EventBody): DriveReading {
    return readDrive(applyEvent(this.state, { ...body, t: this.state.t } as AttemptEvent))
  }

  record(body: EventBody): this {
    const event = { t: this.state.t, ...body } as AttemptEvent
    this.state = applyEvent(this.state, event)
    this.events.push(event)
    return this
  }

  wait(ms: number): this {
    this.state = advance(this.state, Math.round(ms))
    return this
  }

  /** Let time pass in steps until the condition holds; fails loudly when it never does. */
  waitUntil(
    condition: (drive: DriveReading) => boolean,
    what: string,
    stepMs = 100,
    maxMs = 30 * 60_000,
  ): this {
    const limit = this.state.t + maxMs
    while (!condition(this.drive)) {
      if (this.state.t >= limit) throw new Error(`waitUntil: ${what} did not happen within ${maxMs} ms`)
      this.wait(stepMs)
    }
    return this
  }

  press(device: string): this {
    return this.record({ type: 'device.pressed', device })
  }

  release(device: string): this {
    return this.record({ type: 'device.released', device })
  }

  hold(device: string, ms: number): this {
    return this.press(device).wait(ms).release(device)
  }

  /** Hold a button until the condition holds (checked every stepMs), then release it. */
  holdUntil(device: string, condition: (drive: DriveReading) => boolean, what: string, stepMs = 50): this {
    return this.press(device).waitUntil(condition, what, stepMs, 120_000).release(device)
  }

  switchTo(device: string, position: 0 | 1): this {
    return this.record({ type: 'device.switched', device, position })
  }

  turn(device: string, position: number): this {
    return this.record({ type: 'device.turned', device, position })
  }

  wire(id: string, from: string, to: string, colour: WireColour = 'blue'): this {
    return this.record({ type: 'wire.added', id, from, to, colour })
  }

  unwire(id: string): this {
    return this.record({ type: 'wire.removed', id })
  }

  fitContact(device: string, contact: 'NO' | 'NC'): this {
    return this.record({ type: 'device.contactFitted', device, contact })
  }

  set(key: SettingKey, value: SettingValue): this {
    return this.record({ type: 'setting.changed', key, value })
  }

  save(): this {
    return this.record({ type: 'settings.saved' })
  }

  configure(values: Partial<Record<SettingKey, SettingValue>>): this {
    for (const [key, value] of Object.entries(values))
      this.set(key as SettingKey, value as SettingValue).wait(500)
    return this.save()
  }

  powerOn(): this {
    return this.record({ type: 'power.on' })
  }

  powerOff(): this {
    return this.record({ type: 'power.off' })
  }

  lock(): this {
    return this.record({ type: 'lock.applied' })
  }

  unlock(): this {
    return this.record({ type: 'lock.removed' })
  }

  /** The story's supervisor lock still on the disconnect (their name), if any. */
  get supervisorLock(): string | null {
    return this.state.power.supervisorLock?.name ?? null
  }

  /** Ask the story's supervisor to remove their own lock. */
  askSupervisorToUnlock(): this {
    return this.record({ type: 'supervisorLock.removed' })
  }

  probe(red: string | null, black: string | null): this {
    return this.record({ type: 'meter.probes', red, black })
  }

  meterMode(mode: MeterMode): this {
    return this.record({ type: 'meter.mode', mode })
  }

  /** Turn the selector to a range (if it is not there already), then place the probes. */
  measure(red: string, black: string, mode: MeterMode): this {
    if (this.state.meter.mode !== mode) this.meterMode(mode)
    return this.probe(red, black)
  }

  key(key: KeypadKey): this {
    return this.record({ type: 'keypad.key', key })
  }

  /** Record what is wrong before a repair. */
  diagnose(target: DiagnosisTarget, finding: DiagnosisFinding): this {
    return this.record({ type: 'diagnosis.recorded', target, finding })
  }

  hint(hintId: string): this {
    return this.record({ type: 'hint.revealed', hintId })
  }

  end(): AttemptEvent[] {
    this.record({ type: 'attempt.ended' })
    return this.events
  }
}
