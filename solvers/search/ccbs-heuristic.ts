/**
 * The admissible high-level heuristic of the weighted-split CBS (ccbs.ts), in the spirit of
 * the heuristics of Andreychuk, Yakovlev, Boyarski, Stern, "Improving continuous-time conflict
 * based search", AAAI 2021 (cited from memory: there a linear program over the cardinal
 * conflicts' cost increases; here an exact disjunctive cover, our own formulation).
 *
 * Input: a node's priced splits. A split of a conflict between agents i and j is sound, so every
 * conflict-free plan the node admits satisfies one of its children; a child's replanned agent
 * then costs at least the child's optimum. With x_a ≥ 0 the increase of agent a's cost over its
 * cost in the node, every admitted conflict-free plan meets, per split, the DISJUNCTION
 * x_i ≥ Δ_i OR x_j ≥ Δ_j (Δ = child optimum − node cost of that agent, Infinity when the child
 * has no plan). So the least Σ x_a over all x meeting every disjunction is a lower bound on the
 * cost increase of the best admitted plan: h is admissible.
 *
 * That least Σ x is computed exactly by depth-first branch and bound per connected component
 * (x_a only ever needs to be 0 or one of its Δ's: lowering it to the largest Δ it must reach
 * keeps every disjunction met). When a component's search exceeds its step budget, the value
 * falls back to a matching bound (below), also a lower bound on the least Σ x, so h stays
 * admissible, only weaker.
 *
 * Matching bound: for disjunctions over agent-disjoint pairs, x_i + x_j ≥ min(Δ_i, Δ_j) each,
 * and those sums share no x, so Σ x ≥ Σ min over any such set; taken greedily, heaviest first.
 */

/** One priced split: either agent i's cost rises by ≥ di or agent j's by ≥ dj (Infinity: that child has no plan). */
export interface SplitDisjunction {
  readonly i: number;
  readonly di: number;
  readonly j: number;
  readonly dj: number;
}

/**
 * The least Σ x_a ≥ 0 meeting every disjunction (x_i ≥ di or x_j ≥ dj), or a lower bound on it
 * when a component's search runs past `stepBudget`; Infinity when a disjunction has two
 * infinite sides. `agentCount` bounds the agent indices.
 */
export function disjunctiveCover(agentCount: number, splits: readonly SplitDisjunction[], stepBudget = 4000): number {
  // Unit requirements first: a side that cannot be met forces the other.
  const forced = new Float64Array(agentCount);
  const binary: SplitDisjunction[] = [];
  for (const s of splits) {
    if (s.di <= 0 || s.dj <= 0) continue; // met by x = 0
    if (s.di === Infinity && s.dj === Infinity) return Infinity;
    if (s.di === Infinity) forced[s.j] = Math.max(forced[s.j], s.dj);
    else if (s.dj === Infinity) forced[s.i] = Math.max(forced[s.i], s.di);
    else binary.push(s);
  }
  let total = 0;
  for (let a = 0; a < agentCount; a++) total += forced[a];
  // The disjunctions the forced values leave open, grouped by connected component of agents.
  const open = binary.filter((s) => forced[s.i] < s.di && forced[s.j] < s.dj);
  const root = Int32Array.from({ length: agentCount }, (_, a) => a);
  const find = (a: number): number => {
    while (root[a] !== a) {
      root[a] = root[root[a]];
      a = root[a];
    }
    return a;
  };
  for (const s of open) root[find(s.i)] = find(s.j);
  const groups = new Map<number, SplitDisjunction[]>();
  for (const s of open) {
    const g = find(s.i);
    const list = groups.get(g);
    if (list) list.push(s);
    else groups.set(g, [s]);
  }
  for (const list of groups.values()) total += componentIncrease(list, forced, stepBudget);
  return total;
}

/** The least extra Σ x above `base` meeting every disjunction of one component (or the matching bound). */
function componentIncrease(list: readonly SplitDisjunction[], base: Float64Array, stepBudget: number): number {
  // Heaviest first, so that the bound bites early.
  const order = [...list].sort((a, b) => Math.max(b.di, b.dj) - Math.max(a.di, a.dj) || a.i - b.i || a.j - b.j);
  const x = new Map<number, number>();
  const get = (a: number): number => x.get(a) ?? base[a];
  const isMet = (s: SplitDisjunction): boolean => get(s.i) >= s.di || get(s.j) >= s.dj;
  /** Greedy matching over the open disjunctions from `from` on, with what each side still lacks. */
  const matching = (from: number): number => {
    const used = new Set<number>();
    const residual: [number, number, number][] = [];
    for (let k = from; k < order.length; k++) {
      const s = order[k];
      if (isMet(s)) continue;
      residual.push([s.i, s.j, Math.min(s.di - get(s.i), s.dj - get(s.j))]);
    }
    residual.sort((a, b) => b[2] - a[2]);
    let sum = 0;
    for (const [i, j, r] of residual) {
      if (used.has(i) || used.has(j)) continue;
      used.add(i);
      used.add(j);
      sum += r;
    }
    return sum;
  };
  const fallback = matching(0);
  let best = Infinity;
  let steps = 0;
  let isExhausted = false;
  const dfs = (k: number, extra: number): void => {
    if (isExhausted) return;
    if (++steps > stepBudget) {
      isExhausted = true;
      return;
    }
    while (k < order.length && isMet(order[k])) k++;
    if (k === order.length) {
      best = Math.min(best, extra);
      return;
    }
    if (extra + matching(k) >= best) return;
    const s = order[k];
    for (const [a, d] of [[s.i, s.di], [s.j, s.dj]] as const) {
      const was = get(a);
      x.set(a, d);
      dfs(k + 1, extra + d - was);
      x.set(a, was);
    }
  };
  dfs(0, 0);
  return isExhausted ? fallback : best;
}
