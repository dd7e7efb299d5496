/**
 * Reverse Cuthill–McKee ordering of a graph's vertices (Cuthill & McKee 1969; George 1971):
 * breadth-first from a low-degree vertex, neighbours by increasing degree, reversed. It keeps
 * the bandwidth of a frame's stiffness small whatever order the nodes were given in.
 */
export function reverseCuthillMcKee(vertexCount: number, edges: Array<[number, number]>, active: (v: number) => boolean = () => true): number[] {
  const neighbours: number[][] = Array.from({ length: vertexCount }, () => [])
  for (const [a, b] of edges) {
    if (a === b) continue
    neighbours[a].push(b)
    neighbours[b].push(a)
  }
  const degree = neighbours.map((n) => n.length)
  const seen = new Uint8Array(vertexCount)
  const order: number[] = []
  const candidates = Array.from({ length: vertexCount }, (_, i) => i).filter(active).sort((a, b) => degree[a] - degree[b] || a - b)
  for (const start of candidates) {
    if (seen[start]) continue
    seen[start] = 1
    const queue = [start]
    for (let head = 0; head < queue.length; head++) {
      const v = queue[head]
      order.push(v)
      const next = neighbours[v].filter((w) => !seen[w] && active(w)).sort((a, b) => degree[a] - degree[b] || a - b)
      for (const w of next) { seen[w] = 1; queue.push(w) }
    }
  }
  return order.reverse()
}
