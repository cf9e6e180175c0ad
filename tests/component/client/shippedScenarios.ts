// Every scenario file shipped in scenarios/, read at build time (Vite's glob import), for round-trip tests.
const files = import.meta.glob<Record<string, unknown>>('../../../scenarios/*.json', {
  eager: true,
  import: 'default',
})

export const SHIPPED_SCENARIOS: Record<string, unknown>[] = Object.values(files)
