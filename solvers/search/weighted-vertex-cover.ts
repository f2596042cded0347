/**
 * Minimum edge-weighted vertex cover: non-negative integers x_i with x_i + x_j ≥ w_ij for
 * every edge, minimising Σ x_i. Its value is the WDG heuristic of CBS (Li, Felner, Boyarski,
 * Ma, Koenig, "Improved heuristics for multi-agent path finding with conflict-based search",
 * IJCAI 2019). Solved exactly per connected component by depth-first branch and bound; a
 * component whose search exceeds the step budget falls back to a greedy matching, which is
 * still a lower bound (each matched edge needs its own weight), so the heuristic stays
 * admissible.
 */

/** One weighted edge between vertices u and v (weights ≥ 1; zero edges may be omitted). */
export interface WeightedEdge {
  readonly u: number;
  readonly v: number;
  readonly w: number;
}

/** The minimum weighted vertex cover value over vertices 0…n−1 (a lower bound if the budget runs out). */
export function minWeightedVertexCover(n: number, edges: readonly WeightedEdge[], stepBudget = 200_000): number {
  const w = new Map<number, number>();
  const adj: number[][] = Array.from({ length: n }, () => []);
  for (const e of edges) {
    if (e.w <= 0 || e.u === e.v) continue;
    const a = Math.min(e.u, e.v);
    const b = Math.max(e.u, e.v);
    const k = a * n + b;
    const old = w.get(k);
    if (old === undefined) {
      adj[a].push(b);
      adj[b].push(a);
    }
    if (old === undefined || e.w > old) w.set(k, e.w);
  }
  const weight = (a: number, b: number): number => w.get(a < b ? a * n + b : b * n + a) ?? 0;
  const seen = new Uint8Array(n);
  let total = 0;
  for (let s = 0; s < n; s++) {
    if (seen[s] || adj[s].length === 0) continue;
    const comp: number[] = [];
    const stack = [s];
    seen[s] = 1;
    while (stack.length) {
      const v = stack.pop() as number;
      comp.push(v);
      for (const u of adj[v]) if (!seen[u]) { seen[u] = 1; stack.push(u); }
    }
    // Highest degree first makes the bound bite early.
    comp.sort((a, b) => adj[b].length - adj[a].length || a - b);
    total += componentCover(comp, adj, weight, stepBudget);
  }
  return total;
}

function componentCover(comp: number[], adj: number[][], weight: (a: number, b: number) => number, stepBudget: number): number {
  const k = comp.length;
  if (k === 2) return weight(comp[0], comp[1]);
  const pos = new Map<number, number>();
  comp.forEach((v, i) => pos.set(v, i));
  const range = comp.map((v) => Math.max(...adj[v].map((u) => weight(v, u))));
  // Earlier neighbours of each vertex with the edge weight, for the feasibility minimum.
  const earlier: [number, number][][] = comp.map((v, i) => adj[v].filter((u) => (pos.get(u) as number) < i)
    .map((u) => [pos.get(u) as number, weight(v, u)] as [number, number]));
  // Lower bound for the unassigned suffix: a greedy matching among suffix-internal edges.
  const suffixBound = new Array<number>(k + 1).fill(0);
  for (let i = k - 1; i >= 0; i--) {
    const used = new Set<number>();
    const es: [number, number, number][] = [];
    for (let a = i; a < k; a++) for (const [b, wt] of earlier[a]) if (b >= i) es.push([a, b, wt]);
    es.sort((p, q) => q[2] - p[2] || p[0] - q[0] || p[1] - q[1]);
    let sum = 0;
    for (const [a, b, wt] of es) if (!used.has(a) && !used.has(b)) { used.add(a); used.add(b); sum += wt; }
    suffixBound[i] = sum;
  }
  const x = new Array<number>(k).fill(0);
  let best = range.reduce((a, b) => a + b, 0);
  let steps = 0;
  let exhausted = false;
  const dfs = (i: number, sum: number): void => {
    if (exhausted) return;
    if (++steps > stepBudget) { exhausted = true; return; }
    if (sum + suffixBound[i] >= best) return;
    if (i === k) { best = sum; return; }
    let lo = 0;
    for (const [j, wt] of earlier[i]) if (wt - x[j] > lo) lo = wt - x[j];
    for (let c = lo; c <= range[i]; c++) {
      x[i] = c;
      dfs(i + 1, sum + c);
    }
    x[i] = 0;
  };
  dfs(0, 0);
  return exhausted ? suffixBound[0] : best;
}
