// Places items on a line in a fixed order, each as near its wish as it can, with a least gap between
// neighbours: minimises Σ weight·(x − wish)² by merging clusters of touching items (pool adjacent
// violators). Used for objects in a row and for wire ends in a channel.

export interface SpreadItem {
  wish: number
  weight: number
  /** Least distance from the previous item (ignored for the first). */
  gapBefore: number
}

export function spreadInOrder(items: readonly SpreadItem[]): number[] {
  interface Cluster {
    first: number
    last: number
    weight: number
    /** Σ weight · (wish − offset) */
    moment: number
    width: number
  }
  const offsets: number[] = new Array(items.length).fill(0)
  const clusters: Cluster[] = []
  const position = (c: Cluster) => c.moment / c.weight
  items.forEach((item, i) => {
    let current: Cluster = {
      first: i,
      last: i,
      weight: item.weight,
      moment: item.weight * item.wish,
      width: 0,
    }
    for (;;) {
      const previous = clusters[clusters.length - 1]
      if (!previous) break
      const gap = items[current.first].gapBefore
      if (position(previous) + previous.width + gap <= position(current)) break
      const shift = previous.width + gap
      for (let j = current.first; j <= current.last; j++) offsets[j] += shift
      let shiftedMoment = 0
      for (let j = current.first; j <= current.last; j++)
        shiftedMoment += items[j].weight * (items[j].wish - offsets[j])
      clusters.pop()
      current = {
        first: previous.first,
        last: current.last,
        weight: previous.weight + current.weight,
        moment: previous.moment + shiftedMoment,
        width: shift + current.width,
      }
    }
    clusters.push(current)
  })
  const result: number[] = new Array(items.length)
  for (const c of clusters) {
    const start = position(c)
    for (let j = c.first; j <= c.last; j++) result[j] = start + offsets[j]
  }
  return result
}
