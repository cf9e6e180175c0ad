// An XState actor around the pure model, for the panel (@xstate/vue): it records the log as it goes.
import { assign, setup } from 'xstate'
import type { AttemptEvent } from '@shared/model/events'
import type { SimulationSetup } from '@shared/model/setup'
import type { SimState } from '@shared/model/types'
import { advance, applyEvent, createSimulation } from '@shared/model/simulation'

export interface SimulationContext {
  setup: SimulationSetup
  sim: SimState
  /** The attempt's event log so far (events accepted in time order). */
  log: AttemptEvent[]
}

export type SimulationActorEvent =
  /** Record and apply one attempt event (its t must not be before the current time). */
  | { type: 'record'; event: AttemptEvent }
  /** Let simulated time run up to t (integer ms); no event is recorded. */
  | { type: 'tick'; t: number }
  /** Start again from the setup with an empty log. */
  | { type: 'restart' }

export const simulationMachine = setup({
  types: {
    context: {} as SimulationContext,
    input: {} as { setup: SimulationSetup; log?: AttemptEvent[] },
    events: {} as SimulationActorEvent,
  },
  guards: {
    eventInOrder: ({ context, event }) => event.type === 'record' && event.event.t >= context.sim.t,
    tickForward: ({ context, event }) =>
      event.type === 'tick' && Number.isInteger(event.t) && event.t > context.sim.t,
  },
  actions: {
    applyRecorded: assign(({ context, event }) => {
      if (event.type !== 'record') return {}
      return { sim: applyEvent(context.sim, event.event), log: [...context.log, event.event] }
    }),
    advanceToTick: assign(({ context, event }) => {
      if (event.type !== 'tick') return {}
      return { sim: advance(context.sim, event.t - context.sim.t) }
    }),
    restartFromSetup: assign(({ context }) => ({ sim: createSimulation(context.setup), log: [] })),
  },
}).createMachine({
  id: 'simulation',
  context: ({ input }) => {
    let sim = createSimulation(input.setup)
    for (const event of input.log ?? []) sim = applyEvent(sim, event)
    return { setup: input.setup, sim, log: [...(input.log ?? [])] }
  },
  on: {
    record: { guard: 'eventInOrder', actions: 'applyRecorded' },
    tick: { guard: 'tickForward', actions: 'advanceToTick' },
    restart: { actions: 'restartFromSetup' },
  },
})
