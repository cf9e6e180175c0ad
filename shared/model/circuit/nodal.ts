// A general nodal-analysis solver for resistive networks with current sources (Norton form).

/** Node -1 is the reference (0 V). */
export interface ResistiveNetwork {
  nodeCount: number
  /** Conductances in siemens between two nodes. */
  conductances: { a: number; b: number; siemens: number }[]
  /** Currents in amperes injected into a node (from the reference). */
  injections: { node: number; amps: number }[]
}

/**
 * Solves G·v = i for the node voltages by Gaussian elimination with partial pivoting
 * (dense: control networks here have a few dozen nodes at most).
 */
export function solveNodal(network: ResistiveNetwork): Float64Array {
  const n = network.nodeCount
  const g = new Float64Array(n * n)
  const rhs = new Float64Array(n)
  for (const { a, b, siemens } of network.conductances) {
    if (a >= 0) g[a * n + a] += siemens
    if (b >= 0) g[b * n + b] += siemens
    if (a >= 0 && b >= 0) {
      g[a * n + b] -= siemens
      g[b * n + a] -= siemens
    }
  }
  for (const { node, amps } of network.injections) if (node >= 0) rhs[node] += amps
  return solveDense(g, rhs, n)
}

/** Solves a dense n×n system in place (row-major); throws if it is singular. */
export function solveDense(m: Float64Array, rhs: Float64Array, n: number): Float64Array {
  for (let col = 0; col < n; col++) {
    let pivot = col
    let best = Math.abs(m[col * n + col])
    for (let row = col + 1; row < n; row++) {
      const v = Math.abs(m[row * n + col])
      if (v > best) {
        best = v
        pivot = row
      }
    }
    if (best === 0) throw new Error('The network has a node with no path to the reference (singular matrix).')
    if (pivot !== col) {
      for (let k = col; k < n; k++) {
        const tmp = m[col * n + k]
        m[col * n + k] = m[pivot * n + k]
        m[pivot * n + k] = tmp
      }
      const tmp = rhs[col]
      rhs[col] = rhs[pivot]
      rhs[pivot] = tmp
    }
    const diag = m[col * n + col]
    for (let row = col + 1; row < n; row++) {
      const factor = m[row * n + col] / diag
      if (factor === 0) continue
      for (let k = col; k < n; k++) m[row * n + k] -= factor * m[col * n + k]
      rhs[row] -= factor * rhs[col]
    }
  }
  const x = new Float64Array(n)
  for (let row = n - 1; row >= 0; row--) {
    let sum = rhs[row]
    for (let k = row + 1; k < n; k++) sum -= m[row * n + k] * x[k]
    x[row] = sum / m[row * n + row]
  }
  return x
}
