// The meter's leads never cross the drive's display, wherever the probes sit.
import { describe, expect, it } from 'vitest'
import { probeTip } from '@/simulator/scene/hitTest'
import { layoutPanel } from '@/simulator/scene/layout'
import { probeLead } from '@/simulator/scene/probeLeads'
import type { Rect, Vec } from '@/simulator/scene/types'

const layout = layoutPanel([
  { id: 'run', kind: 'selector', label: 'Run', contact: 'NO' },
  { id: 'up', kind: 'pushbutton', label: 'Faster', contact: 'NO' },
  { id: 'pot', kind: 'potentiometer', label: 'Pot' },
])

function crosses(path: Vec[], r: Rect): boolean {
  for (let i = 1; i < path.length; i++) {
    const a = path[i - 1]
    const b = path[i]
    for (let s = 0; s <= 40; s++) {
      const x = a.x + ((b.x - a.x) * s) / 40
      const y = a.y + ((b.y - a.y) * s) / 40
      if (x >= r.x && x <= r.x + r.w && y >= r.y && y <= r.y + r.h) return true
    }
  }
  return false
}

describe('meter leads', () => {
  it('reach every terminal without crossing the drive display or keypad', () => {
    const { display, keys } = layout.drive
    for (const probe of ['red', 'black'] as const) {
      for (const id of [...Object.keys(layout.terminals), null]) {
        const path = probeLead(layout, probe, probeTip(layout, probe, id))
        expect(crosses(path, display), `${probe} lead to ${id} crosses the display`).toBe(false)
        for (const k of keys)
          expect(crosses(path, k.rect), `${probe} lead to ${id} crosses key ${k.key}`).toBe(false)
      }
    }
  })

  it('end at the top of the probe on the terminal', () => {
    const tip = probeTip(layout, 'red', 'drive.l1')
    const path = probeLead(layout, 'red', tip)
    expect(path.at(-1)!.x).toBe(tip.x)
    expect(path.at(-1)!.y).toBeLessThan(tip.y)
  })
})
