/**
 * The online-learned cost-to-go estimate ĥ of the EECBS high level (Li, Ruml, Koenig, "EECBS: A
 * bounded-suboptimal search for multi-agent path finding", AAAI 2021), after the one-step error
 * correction of Thayer, Dionne, Ruml ("Learning inadmissible heuristics during search", ICAPS
 * 2011). The formula is as we recall it from the EECBS paper (written from memory):
 * after each expansion, with N the expanded node and C its best child (fewest conflicts, then
 * least f), the one-step errors are
 *   ε_h = f(C) − f(N)          (f = cost + admissible h: the cost the step added beyond h)
 *   ε_d = d(C) − (d(N) − 1)    (d = number of conflicts: the conflicts the step failed to remove)
 * and, with their running means ε̄_h and ε̄_d,
 *   ĥ(N) = h(N) + ε̄_h · d(N) / (1 − ε̄_d)   when ε̄_d < 1.
 * When ε̄_d ≥ 1 (conflicts do not go down on average) the division is meaningless; we then use
 * ĥ = h + ε̄_h · d(N) (one mean step per conflict), our own choice. ĥ only orders OPEN and FOCAL:
 * no bound depends on it.
 */

/** Running means of the one-step errors. */
export class CostToGoEstimate {
  private sumH = 0;
  private sumD = 0;
  private count = 0;

  /** Records one expansion: parent's f and conflicts, best child's f and conflicts. */
  learn(parentF: number, parentD: number, childF: number, childD: number): void {
    this.sumH += Math.max(0, childF - parentF);
    this.sumD += childD - (parentD - 1);
    this.count++;
  }

  /** ĥ of a node with admissible part h and d conflicts. */
  estimate(h: number, d: number): number {
    if (this.count === 0 || d === 0) return h;
    const eh = this.sumH / this.count;
    const ed = this.sumD / this.count;
    return h + (ed < 1 ? (eh * d) / (1 - ed) : eh * d);
  }
}
