// The schematic of a wiring state: every device and every wire drawn, each wire's marker once, no text
// on another text and no wire under a marker, for the shipped scenarios, the reference solutions and
// any wiring an apprentice can make on the way (fast-check).
import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { DRIVE_CONTROL_POINTS, DRIVE_POWER_POINTS, WIRE_COLOURS } from '@shared/model'
import {
  drawSchematic,
  layoutProblems,
  wireMarkerText,
  wiringOfState,
  type SchematicDrawing,
  type Wiring,
} from '@shared/schematic'
import {
  attemptFixtures,
  endState,
  scenarioById,
  shippedScenarios,
  startState,
} from '../../support/shipped-attempts'

function expectReadable(wiring: Wiring, drawing: SchematicDrawing): void {
  const { layout, svg } = drawing
  expect(layoutProblems(layout)).toEqual([])
  // Every wire once, with the number and colour code the panel prints on its marker.
  expect(layout.wires).toHaveLength(wiring.wires.length)
  wiring.wires.forEach((wire, i) => {
    const marker = wireMarkerText(wire.id, wire.colour, i)
    const placed = layout.wires[i]
    expect(placed.marker).toBe(marker)
    expect(placed.path.length).toBeGreaterThanOrEqual(2)
  })
  const markers = layout.texts.filter((t) => t.kind === 'wireLabel').map((t) => t.text)
  expect(markers.sort()).toEqual(layout.wires.map((w) => w.marker).sort())
  for (const marker of new Set(markers)) {
    const expected = markers.filter((m) => m === marker).length
    expect(svg.split(`>${marker}</text>`).length - 1).toBe(expected)
  }
  // Every device with its name and terminal markings.
  for (const device of wiring.devices) {
    const placed = layout.devices.find((d) => d.key === device.id)
    expect(placed, device.label).toBeDefined()
    const words = layout.texts
      .filter((t) => t.kind === 'deviceName' && t.box.x >= (placed?.box.x ?? 0) - 1)
      .map((t) => t.text)
      .join(' ')
    expect(words).toContain(device.label.split(/\s+/)[0])
  }
}

function noInternalIds(drawing: SchematicDrawing, ids: string[]): void {
  const shown = drawing.layout.texts.map((t) => t.text).join('\n')
  for (const id of ids) expect(shown).not.toContain(id)
  expect(shown).not.toMatch(/drive\.|\bundefined\b|\bNaN\b/)
}

describe('schematic of the shipped scenarios', () => {
  it.each(shippedScenarios().map((s) => [s.id, s] as const))('%s, starting wiring', (_id, scenario) => {
    const wiring = wiringOfState(startState(scenario))
    const drawing = drawSchematic(wiring)
    expectReadable(wiring, drawing)
    noInternalIds(drawing, [...wiring.devices.map((d) => d.id), ...wiring.wires.map((w) => w.id)])
  })

  it.each(attemptFixtures().map((f) => [`${f.scenario} ${f.name}`, f] as const))(
    '%s, wiring at the end of the attempt',
    (_id, fixture) => {
      const scenario = scenarioById(fixture.scenario)
      const wiring = wiringOfState(endState(scenario, fixture.events))
      expect(wiring.wires.length).toBeGreaterThan(0)
      const drawing = drawSchematic(wiring)
      expectReadable(wiring, drawing)
      noInternalIds(drawing, [...wiring.devices.map((d) => d.id), ...wiring.wires.map((w) => w.id)])
      // The drive's terminals appear with their panel labels.
      for (const label of ['+24', '0V', 'DIC', 'DI1']) {
        expect(drawing.layout.texts.some((t) => t.kind === 'terminal' && t.text === label)).toBe(true)
      }
    },
  )
})

const runSwitch = { id: 'runSwitch', kind: 'selector', label: 'Run / stop', contact: 'NO' } as const
const faster = { id: 'raiseButton', kind: 'pushbutton', label: 'Faster', contact: 'NO' } as const
const stop = { id: 'stopButton', kind: 'pushbutton', label: 'Stop', contact: 'NC' } as const
const pot = { id: 'speedPot', kind: 'potentiometer', label: 'Speed', ohms: 10000 } as const
const wire = (id: string, from: string, to: string, colour: Wiring['wires'][number]['colour'] = 'blue') => ({
  id,
  from,
  to,
  colour,
})

describe('schematic layout rules', () => {
  it('puts the supply row at the top and the 0 V row at the bottom, devices between', () => {
    const { layout } = drawSchematic({
      devices: [runSwitch],
      wires: [
        wire('w1', 'drive.p24', 'runSwitch.a'),
        wire('w2', 'runSwitch.b', 'drive.di1'),
        wire('w3', 'drive.dcom', 'drive.0v'),
      ],
    })
    const y = (label: string) => layout.terminals.find((t) => t.label === label)!.box.y
    const device = layout.devices[0]
    expect(y('+24')).toBeLessThan(device.top)
    expect(device.bottom).toBeLessThan(y('DI1'))
    expect(y('DI1')).toBeLessThan(y('0V'))
  })

  it('draws contacts of source wiring below the inputs, between them and 0 V', () => {
    const { layout } = drawSchematic({
      devices: [runSwitch],
      wires: [
        wire('w1', 'drive.dcom', 'drive.p24'),
        wire('w2', 'drive.di1', 'runSwitch.a'),
        wire('w3', 'runSwitch.b', 'drive.0v'),
      ],
    })
    const y = (label: string) => layout.terminals.find((t) => t.label === label)!.box.y
    expect(layout.devices[0].top).toBeGreaterThan(y('DI1'))
    expect(layout.devices[0].bottom).toBeLessThan(y('0V'))
  })

  it('draws a short from +24 to 0V as one wire from the top row to the bottom row', () => {
    const { layout } = drawSchematic({ devices: [], wires: [wire('w1', 'drive.p24', 'drive.0v', 'red')] })
    const [short] = layout.wires
    const box = (label: string) => layout.terminals.find((t) => t.label === label)!.box
    expect(short.path[0].y).toBeCloseTo(box('+24').y + box('+24').h)
    expect(short.path[short.path.length - 1].y).toBeCloseTo(box('0V').y)
    expect(short.fromName).toBe('Drive +24')
    expect(short.toName).toBe('Drive 0V')
  })

  it('draws a wire to a point on no terminal as a loose end, in plain words', () => {
    const drawing = drawSchematic({
      devices: [faster],
      wires: [wire('w1', 'drive.di4', 'nowhere.x', 'orange')],
    })
    expect(drawing.layout.devices.map((d) => d.name)).toContain('Loose end')
    expect(drawing.layout.wires[0].toName).toBe('Loose end')
    expect(drawing.svg).not.toContain('nowhere')
    expect(layoutProblems(drawing.layout)).toEqual([])
  })

  it('draws devices with no wires, wires between devices and a wire across one contact', () => {
    const wiring: Wiring = {
      devices: [runSwitch, faster, stop, pot],
      wires: [wire('w1', 'runSwitch.a', 'raiseButton.b'), wire('w2', 'runSwitch.a', 'runSwitch.b', 'violet')],
    }
    expectReadable(wiring, drawSchematic(wiring))
  })

  it('numbers wires as the panel does: the digits ending the id, else the position', () => {
    expect(wireMarkerText('w3', 'blue', 0)).toBe('W3 BU')
    expect(wireMarkerText('wCom', 'whiteBlue', 0)).toBe('W1 WHBU')
    expect(wireMarkerText('wRunFeed', 'greenYellow', 4)).toBe('W5 GNYE')
  })

  it('marks contact blocks with their IEC 60947-5-1 terminal numbers', () => {
    const { layout } = drawSchematic({ devices: [faster, stop], wires: [] })
    const markings = layout.texts.filter((t) => t.kind === 'marking').map((t) => t.text)
    expect(markings.sort()).toEqual(['11', '12', '13', '14'])
  })

  it('reports a marker placed over another wire, and texts on texts', () => {
    const { layout } = drawSchematic({
      devices: [runSwitch],
      wires: [wire('w1', 'drive.p24', 'runSwitch.a'), wire('w2', 'runSwitch.b', 'drive.di1')],
    })
    const [first, second] = layout.wires
    const moved = {
      ...second.markerBox,
      x: first.path[0].x - second.markerBox.w / 2,
      y: (first.path[0].y + first.path[1].y) / 2,
    }
    const broken = {
      ...layout,
      wires: [first, { ...second, markerBox: moved }],
      texts: [...layout.texts, { ...layout.texts[0], box: { ...layout.texts[1].box } }],
    }
    const problems = layoutProblems(broken)
    expect(problems.some((p) => p.includes('runs under the marker of W2'))).toBe(true)
    expect(problems.some((p) => p.includes('overlaps'))).toBe(true)
  })

  it('escapes text for XML', () => {
    const { svg } = drawSchematic({ devices: [{ ...faster, label: 'Raise <fast> & "hold"' }], wires: [] })
    expect(svg).toContain('Raise &lt;fast&gt; &amp;')
    expect(svg).not.toContain('<fast>')
  })
})

const devicePool = [
  runSwitch,
  faster,
  stop,
  pot,
  {
    id: 'lowerButton',
    kind: 'pushbutton',
    label: 'Slower and a much longer name than usual',
    contact: 'NO',
  } as const,
]

const wiringArbitrary: fc.Arbitrary<Wiring> = fc.subarray(devicePool).chain((devices) => {
  const points = [
    ...DRIVE_CONTROL_POINTS,
    ...devices.flatMap((d) =>
      (d.kind === 'potentiometer' ? ['hi', 'wiper', 'lo'] : ['a', 'b']).map((t) => `${d.id}.${t}`),
    ),
    DRIVE_POWER_POINTS[0],
    'ghost.x',
  ]
  const oneWire = fc.record({
    from: fc.constantFrom(...points),
    to: fc.constantFrom(...points),
    colour: fc.constantFrom(...WIRE_COLOURS),
  })
  return fc
    .array(oneWire, { maxLength: 22 })
    .map((wires) => ({ devices, wires: wires.map((w, i) => ({ id: `w${i + 1}`, ...w })) }))
})

describe('schematic of any wiring (generated)', () => {
  it('never throws, and stays readable', () => {
    fc.assert(
      fc.property(wiringArbitrary, (wiring) => {
        expectReadable(wiring, drawSchematic(wiring))
      }),
      { numRuns: Number(process.env.SCHEMATIC_RUNS ?? 120) },
    )
  }, 60_000)
})
