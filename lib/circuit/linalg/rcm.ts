/**
 * Reverse Cuthill–McKee ordering (E. Cuthill, J. McKee, "Reducing the bandwidth of sparse
 * symmetric matrices", ACM National Conference 1969; reversal by A. George, 1971).
 *
 * Applied to the symmetrised sparsity pattern of the MNA matrix so that a banded LU stays
 * narrow: a diode–capacitor ladder is a chain of small cliques, so its bandwidth after RCM is a
 * small constant independent of the stage count.
 */

/**
 * Computes an RCM permutation.
 * @param size number of unknowns
 * @param edges off-diagonal structural non-zeros as [row, col] pairs (either orientation)
 * @returns `order`, where `order[newIndex] = oldIndex`
 */
export function reverseCuthillMcKee(size: number, edges: ReadonlyArray<readonly [number, number]>): Int32Array {
  const adjacency: number[][] = Array.from({ length: size }, () => []);
  for (const [a, b] of edges) {
    if (a === b || a < 0 || b < 0) continue;
    adjacency[a].push(b);
    adjacency[b].push(a);
  }
  for (const list of adjacency) {
    list.sort((x, y) => x - y);
    let w = 0;
    for (let i = 0; i < list.length; i++) if (i === 0 || list[i] !== list[i - 1]) list[w++] = list[i];
    list.length = w;
  }
  const degree = adjacency.map((l) => l.length);
  const visited = new Uint8Array(size);
  const order: number[] = [];
  while (order.length < size) {
    // Start each component from a pseudo-peripheral node: lowest degree, then one BFS sweep to
    // the farthest node (George–Liu heuristic, simplified to one sweep).
    let start = -1;
    for (let i = 0; i < size; i++) if (!visited[i] && (start < 0 || degree[i] < degree[start])) start = i;
    start = farthestFrom(start, adjacency, visited, degree);
    visited[start] = 1;
    const queue = [start];
    for (let head = 0; head < queue.length; head++) {
      const v = queue[head];
      order.push(v);
      const next = adjacency[v].filter((w) => !visited[w]).sort((x, y) => degree[x] - degree[y] || x - y);
      for (const w of next) {
        visited[w] = 1;
        queue.push(w);
      }
    }
  }
  order.reverse();
  return Int32Array.from(order);
}

function farthestFrom(start: number, adjacency: number[][], visited: Uint8Array, degree: number[]): number {
  const dist = new Map<number, number>([[start, 0]]);
  const queue = [start];
  let best = start;
  for (let head = 0; head < queue.length; head++) {
    const v = queue[head];
    const d = dist.get(v) ?? 0;
    const bestDist = dist.get(best) ?? 0;
    if (d > bestDist || (d === bestDist && degree[v] < degree[best])) best = v;
    for (const w of adjacency[v]) {
      if (visited[w] || dist.has(w)) continue;
      dist.set(w, d + 1);
      queue.push(w);
    }
  }
  return best;
}

/** Lower and upper half-bandwidths of a pattern under a permutation (`position[old] = new`). */
export function bandwidths(
  edges: ReadonlyArray<readonly [number, number]>,
  position: ArrayLike<number>,
): { lower: number; upper: number } {
  let lower = 0;
  let upper = 0;
  for (const [r, c] of edges) {
    const d = position[c] - position[r];
    if (d > upper) upper = d;
    if (-d > lower) lower = -d;
  }
  return { lower, upper };
}
