/**
 * Conflict classification by MDDs (Boyarski et al., "ICBS: Improved conflict-based search
 * algorithm for multi-agent pathfinding", IJCAI 2015): a conflict is cardinal when both
 * children must raise their agent's cost, semi-cardinal when one must, non-cardinal otherwise.
 * An agent's child must raise its cost exactly when every path of its current cost passes
 * the conflict, i.e. its MDD level there is that single cell (or move).
 */
import { type Conflict, K_EDGE, K_TARGET, P_CARDINAL, P_NON, P_SEMI } from './conflict';
import type { Mdd } from './mdd';

/**
 * Sets `priority` and `isMddCardinal` of a vertex, edge or target conflict from the two
 * agents' MDDs. For a semi-cardinal vertex or edge conflict the agents are swapped so that
 * `a1` is the pinned one (disjoint splitting then constrains it).
 */
export function classifyByMdds(c: Conflict, m1: Mdd, m2: Mdd): void {
  let card1: boolean;
  let card2: boolean;
  if (c.kind === K_EDGE) {
    card1 = m1.cellIfSingleton(c.t - 1) === c.cell && m1.cellIfSingleton(c.t) === c.cell2;
    card2 = m2.cellIfSingleton(c.t - 1) === c.cell2 && m2.cellIfSingleton(c.t) === c.cell;
  } else if (c.kind === K_TARGET) {
    card1 = true; // a last arrival after t costs agent 1 at least t + 1, more than its current cost
    card2 = m2.cellIfSingleton(c.t) === c.cell;
  } else {
    card1 = m1.cellIfSingleton(c.t) === c.cell;
    card2 = m2.cellIfSingleton(c.t) === c.cell;
  }
  c.isMddCardinal = card1 && card2;
  c.priority = card1 && card2 ? P_CARDINAL : card1 || card2 ? P_SEMI : P_NON;
  if (card2 && !card1 && c.kind !== K_TARGET) {
    const { a1, a2 } = c;
    c.a1 = a2;
    c.a2 = a1;
    if (c.kind === K_EDGE) {
      const x = c.cell;
      c.cell = c.cell2;
      c.cell2 = x;
    }
  }
}
