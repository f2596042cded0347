/**
 * The sentences of the model comparison report, generated from its figures. They claim an order
 * only when 95 % intervals do not overlap, come from at least MIN_RANKED_INSTANCES instances and
 * are not both of zero width; they say "not distinguishable" or "too few to tell" otherwise, and
 * warn when samples are small; nothing here is a safety statement (the report carries SAFETY_NOTE).
 */
import type { Interval95 } from '@shared/confidence-interval';
import { MIN_RANKED_INSTANCES, MIXED_SETTINGS_NOTE, type CommonInstanceComparison, type CommonInstanceFigures, type VariantFigures } from '@shared/reports';
import type { SweepPolicy } from '@shared/sweeps';

/** Below this many executed instances per variant the summary says the figures are indicative (common practice, not a rule). */
export const SMALL_SAMPLE_INSTANCES = 10;

/** "12 %" (whole percent; one decimal below 10 % when not whole). */
export function pct(share: number): string {
  const p = share * 100;
  const text = Math.abs(p) < 10 && Math.round(p) !== p ? p.toFixed(1) : Math.round(p).toFixed(0);
  return `${text === '-0' ? '0' : text} %`;
}

/** "[8 %, 15 %]". */
const pctInterval = (ci: Interval95): string => `[${pct(ci[0])}, ${pct(ci[1])}]`;

/** Whether two intervals share a point. */
export const overlaps = (a: Interval95, b: Interval95): boolean => a[0] <= b[1] && b[0] <= a[1];

/**
 * Whether interval `a` lies wholly below `b` in a way that may support an ordering claim: no
 * overlap, and not both of zero width (meanInterval gives [x, x] for constant values, which is no
 * evidence from a small sample). The caller checks the number of instances.
 */
export const clearlyBelow = (a: Interval95, b: Interval95): boolean => a[1] < b[0] && (a[1] > a[0] || b[1] > b[0]);

/** "a, b and c". */
function listOf(items: readonly string[]): string {
  return items.length <= 1 ? items.join('') : `${items.slice(0, -1).join(', ')} and ${items[items.length - 1]}`;
}

function nominalClause(v: VariantFigures): string {
  if (v.nominalChecked === 0) return v.solved === 0 ? '' : 'executability at nominal times not checked';
  const rate = v.executableRate !== null && v.executableCi95 !== null ? ` (executable-at-nominal rate ${pct(v.executableRate)} ${pctInterval(v.executableCi95)})` : '';
  if (v.nominalExecutable === v.nominalChecked) return `executable at nominal times in all ${v.nominalChecked} checked solved instances${rate}`;
  return `collided at nominal times in ${v.nominalChecked - v.nominalExecutable} of ${v.nominalChecked} checked solved instances${rate}`;
}

function successClause(v: VariantFigures): string {
  if (v.runs === 0 || v.executionSuccessRate === null) return 'not executed under this policy';
  const n = v.executedInstances;
  const ci = v.executionSuccessCi95;
  // A constant rate over instances gives a zero-width t interval: shown as such, not as [x, x].
  const figure = ci === null
    ? `execution success ${pct(v.executionSuccessRate)} on ${n} executed instance (${v.runs} runs; too few instances for an interval)`
    : ci[0] === ci[1]
      ? `execution success ${pct(v.executionSuccessRate)} on each of the ${n} executed instances (${v.runs} runs; no spread between instances, so no interval)`
      : `execution success ${pct(v.executionSuccessRate)} ${pctInterval(ci)} (mean over ${n} executed instances, ${v.runs} runs)`;
  const collided = v.instancesWithCollisions > 0 ? `, collisions in ${v.instancesWithCollisions} of ${n} executed instances` : '';
  const deadlocked = v.instancesWithFailuresWithoutCollision > 0
    ? `, failed runs without collision (deadlocks) in ${v.instancesWithFailuresWithoutCollision} of ${n} executed instances` : '';
  return `${figure}${collided}${deadlocked}`;
}

function makespanClause(v: VariantFigures): string {
  if (v.isReference) return 'reference for realised makespan';
  const { pairs, ratio, ci95 } = v.makespanVsClassic;
  if (pairs === 0 || ratio === null) return 'no instance to compare with classic';
  const word = (r: number) => (r <= 1 ? 'sooner' : 'later');
  if (ci95 === null) return `finished ${pct(Math.abs(1 - ratio))} ${word(ratio)} than classic on ${pairs} instance (too few for an interval)`;
  if (pairs < MIN_RANKED_INSTANCES || ci95[1] === ci95[0]) {
    return `realised makespan ${ratio.toFixed(3)} times classic's on ${pairs} paired instances, too few to tell whether it is sooner or later (an order needs at least ${MIN_RANKED_INSTANCES} paired instances and a spread between them)`;
  }
  if (ci95[1] < 1 || ci95[0] > 1) {
    // Sooner by 1 − ratio: the interval's ends swap.
    const lo = ratio < 1 ? 1 - ci95[1] : ci95[0] - 1;
    const hi = ratio < 1 ? 1 - ci95[0] : ci95[1] - 1;
    return `finished ${pct(Math.abs(1 - ratio))} [${pct(lo)}, ${pct(hi)}] ${word(ratio)} than classic (${pairs} paired instances)`;
  }
  return `realised makespan not distinguishable from classic (ratio ${ratio.toFixed(3)}, interval [${ci95[0].toFixed(3)}, ${ci95[1].toFixed(3)}] includes 1; ${pairs} paired instances)`;
}

/** One sentence per variant. */
function variantSentence(v: VariantFigures): string {
  const solved = v.solvedRate === null || v.solvedCi95 === null ? 'no instances' : `solved ${v.solved} of ${v.instances} instances (${pct(v.solvedRate)} ${pctInterval(v.solvedCi95)})`;
  const clauses = [solved, nominalClause(v), v.solved > 0 ? successClause(v) : '', v.solved > 0 ? makespanClause(v) : ''].filter((c) => c !== '');
  return `${capitalise(v.label)}: ${clauses.join('; ')}.`;
}

const capitalise = (s: string): string => s.charAt(0).toUpperCase() + s.slice(1);

/** The variants not clearly below the one with the highest mean execution success on the common instances. */
function topBySuccess(compared: readonly CommonInstanceFigures[]): CommonInstanceFigures[] {
  const best = [...compared].sort((a, b) => b.success - a.success)[0];
  return compared.filter((v) => v === best || !clearlyBelow(v.successCi95!, best.successCi95!));
}

const successFigure = (v: CommonInstanceFigures): string =>
  `${v.label} (${pct(v.success)} ${v.successCi95![0] === v.successCi95![1] ? 'on each instance' : pctInterval(v.successCi95!)})`;

/**
 * The sentence that answers "which plan model for these robots", as far as the intervals allow.
 * Variants are compared on the instances every executed variant solved and replayed; below
 * MIN_RANKED_INSTANCES of them, or with mixed replay settings, no order is claimed. The variants
 * whose mean execution success is not clearly below the best one's lead (no order among them); of
 * those, the ones seen colliding at nominal times are named; among the rest one is named fastest
 * only when its makespan interval on the same instances is clearly below every other one's.
 */
function choiceSentence(variants: readonly VariantFigures[], comparison: CommonInstanceComparison | null, policy: SweepPolicy, settingsMixed: boolean): string {
  const head = `Which plan model for these robots under ${policy}: `;
  if (settingsMixed) return `${head}not ranked. ${MIXED_SETTINGS_NOTE}`;
  if (comparison === null || comparison.variants.length === 0) return `No variant was executed under ${policy}, so the report cannot say which plan model suits these robots.`;
  const compared = comparison.variants;
  if (compared.length === 1) return `${head}only ${compared[0].label} was executed under this policy, so there is nothing to compare it with.`;
  const n = comparison.instances;
  const scope = `on the ${n} instances every executed variant solved and replayed`;
  if (n < MIN_RANKED_INSTANCES || compared.some((v) => v.successCi95 === null)) {
    const fewest = [...variants].filter((v) => v.executedInstances > 0).sort((a, b) => a.executedInstances - b.executedInstances)[0];
    return `${head}too few instances to tell the variants apart: only ${n} ${n === 1 ? 'instance was' : 'instances were'} solved and replayed by every executed variant `
      + `(${fewest.label} on ${fewest.executedInstances}), and an order needs at least ${MIN_RANKED_INSTANCES}.`;
  }
  const top = topBySuccess(compared);
  const byLabel = new Map(variants.map((v) => [v.label, v]));
  const collidingAtNominal = top.filter((c) => { const v = byLabel.get(c.label)!; return v.nominalChecked > v.nominalExecutable; });
  // Not seen colliding at nominal times (including variants never checked, named as such below).
  const candidates = top.filter((c) => !collidingAtNominal.includes(c));
  const unchecked = candidates.filter((c) => byLabel.get(c.label)!.nominalChecked === 0);
  const parts: string[] = [];
  if (top.length === 1) {
    parts.push(`${scope}, ${successFigure(top[0])} has the highest mean execution success rate, its interval clear of every other variant's (${compared.filter((v) => v !== top[0]).map(successFigure).join('; ')})`);
  } else if (top.length === compared.length) {
    parts.push(`${scope}, execution success does not rank the variants: no interval lies clearly below the best one's (${compared.map(successFigure).join('; ')})`);
  } else {
    parts.push(`${scope}, ${listOf(top.map(successFigure))} lead on mean execution success (their intervals overlap the best one's, so no order among them; the others' lie wholly below it: ${compared.filter((v) => !top.includes(v)).map(successFigure).join('; ')})`);
  }
  if (collidingAtNominal.length > 0) parts.push(`of these, ${listOf(collidingAtNominal.map((v) => v.label))} collided at nominal times on some instances`);
  // The variants left, named again only when some were set aside, and which of them nobody checked.
  const named = collidingAtNominal.length > 0 || top.length === 1 ? listOf(candidates.map((v) => v.label)) : 'these';
  const allUnchecked = unchecked.length > 0 && unchecked.length === candidates.length;
  const uncheckedNote = allUnchecked
    ? (candidates.length === 1 ? ' (not checked at nominal times)' : ' (none of them checked at nominal times)')
    : unchecked.length ? ` (${listOf(unchecked.map((v) => v.label))} not checked at nominal times)` : '';
  const withRatio = candidates.filter((v) => v.makespanRatioCi95 !== null);
  const ciOf = (v: CommonInstanceFigures): Interval95 => v.makespanRatioCi95!;
  const fastest = [...withRatio].sort((a, b) => ciOf(a)[1] - ciOf(b)[1])[0];
  const undecided = 'their realised makespans on these instances do not single out one of them (overlapping, constant or missing intervals)';
  if (fastest && withRatio.length > 1 && withRatio.length === candidates.length && withRatio.every((v) => v === fastest || clearlyBelow(ciOf(fastest), ciOf(v)))) {
    parts.push(`of ${named}${uncheckedNote}, ${fastest.label} finished soonest on these instances, its makespan interval (relative to classic) clear of the others'`);
  } else if (candidates.length > 1) {
    if (collidingAtNominal.length > 0) parts.push(`${named}${uncheckedNote} remain, and ${undecided}`);
    else if (allUnchecked) parts.push(`${undecided}; none of them was checked at nominal times`);
    else parts.push(`none of ${named}${uncheckedNote} was seen colliding at nominal times, and ${undecided}`);
  } else if (candidates.length === 1 && top.length > 1) {
    parts.push(`${named}${uncheckedNote} remains`);
  }
  return `${head}${parts.join('; ')}.`;
}

/** How well the planned cost predicts the realised makespan, per variant, in words. */
function predictionSentence(variants: readonly VariantFigures[]): string | null {
  const phrases = variants.filter((v) => v.plannedVsRealised.n > 0).map((v) => {
    const { n, rho, ci95 } = v.plannedVsRealised;
    if (rho === null) return `cannot be said for ${v.label} (n = ${n}, no spread)`;
    const figure = `ρ = ${rho.toFixed(2)}${ci95 ? ` [${ci95[0].toFixed(2)}, ${ci95[1].toFixed(2)}]` : ''}, n = ${n}`;
    if (ci95 === null) return `cannot be judged for ${v.label} (${figure}, too few instances for an interval)`;
    if (ci95[0] <= 0 && ci95[1] >= 0) return `shows no clear link for ${v.label} (${figure}, the interval includes 0)`;
    // Judged on the interval's inner end, so a high ρ from few pairs is not called strong.
    const strength = ci95[1] < 0 ? 'runs against it'
      : ci95[0] >= 0.8 ? 'predicts it strongly'
        : ci95[0] >= 0.5 ? 'predicts it at least moderately'
          : 'is positively linked to it, though how strongly the interval leaves open';
    return `${strength} for ${v.label} (${figure})`;
  });
  if (phrases.length === 0) return null;
  return `Does the planned cost predict execution? The planned turn-inclusive makespan ${phrases.join('; ')}; the instances mix agent counts, so part of this agreement comes from instance size.`;
}

/** The report's sentences: scope, one per variant, the choice, the prediction, and a small-sample warning. */
export function summarise(input: {
  readonly setName: string;
  readonly profileLabel: string;
  readonly policy: SweepPolicy;
  readonly instances: number;
  readonly executionSettings: readonly string[];
  readonly variants: readonly VariantFigures[];
  readonly comparison: CommonInstanceComparison | null;
}): string[] {
  const { variants } = input;
  const settings = input.executionSettings.length === 0 ? 'no replays stored' : `replays with ${input.executionSettings.join('; ')}`;
  const out = [`For robot profile ${input.profileLabel} under ${input.policy} execution on instance set "${input.setName}": ${input.instances} instances (scenario × agent count), ${variants.length} plan model variants, ${settings}.`];
  if (variants.length === 0) return [...out, 'No computed results match; run a sweep with this robot profile on this set.'];
  out.push(...variants.map(variantSentence));
  out.push(choiceSentence(variants, input.comparison, input.policy, input.executionSettings.length > 1));
  const prediction = predictionSentence(variants);
  if (prediction) out.push(prediction);
  const executed = variants.filter((v) => v.executedInstances > 0).map((v) => v.executedInstances);
  const smallest = executed.length ? Math.min(...executed) : 0;
  if (smallest < SMALL_SAMPLE_INSTANCES) {
    out.push(`Small samples (as few as ${smallest} executed instances for a variant): the intervals are wide, so read these figures as indicative, not as a ranking.`);
  }
  return out;
}
