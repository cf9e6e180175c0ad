// Writes shared/schematic/fontMetrics.ts: the advance widths of Atkinson Hyperlegible (regular and
// bold), so the schematic can measure its labels without a DOM and place them without overlaps.
// Run: npx tsx --tsconfig tsconfig.node.json server/records/scripts/generate-font-metrics.ts
import { writeFileSync } from 'node:fs'
import { resolve } from 'node:path'
import { fontMetricsSource } from '../fontMetrics'

const target = resolve(import.meta.dirname, '../../../shared/schematic/fontMetrics.ts')
writeFileSync(target, fontMetricsSource())
console.log(`wrote ${target}`)
