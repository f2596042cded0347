/** The command template of external solvers: words, placeholders, refusals, and values that can never become more arguments or a shell command. */
import {
  commandArguments, EXAMPLE_SOLVER, ExternalSolverRequestSchema, parseCommandTemplate, parseSolverKey, PLACEHOLDERS, type Placeholder,
} from './external-solvers';

const values = (over: Partial<Record<Placeholder, string>> = {}): Record<Placeholder, string> => ({
  map: '/tmp/run/a.map', scenario: '/tmp/run/a.scen', agents: '4', plan: '/tmp/run/plan.txt', timeLimitMs: '1000', memoryLimitMb: '256',
  seed: '1', model: 'classic', k: '0', startHeading: 'free', scenarioId: '7', node: '/usr/bin/node', ...over,
});

const argvOf = (template: string, over: Partial<Record<Placeholder, string>> = {}) => {
  const parsed = parseCommandTemplate(template);
  if (!parsed.ok) throw new Error(parsed.problems.join('; '));
  return commandArguments(parsed.words, values(over));
};

describe('command templates', () => {
  it('splits at spaces and replaces placeholders inside words', () => {
    expect(argvOf('/opt/pp/bin/solve  --map={map} -s {scenario} -n {agents} -o {plan} --limit {timeLimitMs}ms')).toEqual([
      '/opt/pp/bin/solve', '--map=/tmp/run/a.map', '-s', '/tmp/run/a.scen', '-n', '4', '-o', '/tmp/run/plan.txt', '--limit', '1000ms',
    ]);
  });

  it('keeps every value one argument, whatever characters it holds (no shell, no splitting)', () => {
    const hostile = ['a b', '$(rm -rf /)', '`id`', 'x; touch /tmp/pwned', "' \" \\", '{plan}', '*', '--flag', 'a\nb'];
    let compared = 0;
    for (const value of hostile) {
      const argv = argvOf('/bin/solver {map} {scenario} {agents} {plan}', { map: value, plan: value });
      expect(argv).toEqual(['/bin/solver', value, '/tmp/run/a.scen', '4', value]);
      compared++;
    }
    expect(compared).toBe(hostile.length);
    // A value that looks like a placeholder is not replaced again.
    expect(argvOf('/bin/s {map} {scenario} {agents} {plan}', { map: '{agents}' })[1]).toBe('{agents}');
  });

  it('refuses unknown placeholders, stray braces, missing required ones and a placeholder as the program', () => {
    const problems = (t: string) => {
      const p = parseCommandTemplate(t);
      return p.ok ? [] : p.problems;
    };
    expect(problems('/bin/s {map} {scenario} {agents} {plan} {mapp}')).toEqual([expect.stringContaining('{mapp} is not a placeholder')]);
    expect(problems('/bin/s {map} {scenario} {agents} {plan} {oops')).toEqual([expect.stringContaining('brace')]);
    expect(problems('/bin/s {map} {scenario} {agents}')).toEqual(['the command must use {plan}']);
    expect(problems('{map} {scenario} {agents} {plan}')).toEqual([expect.stringContaining('the program (first word)')]);
    expect(problems('   ')).toEqual(['the command is empty']);
    expect(problems(EXAMPLE_SOLVER.command)).toEqual([]);
  });

  it('documents every placeholder it accepts', () => {
    const all = Object.keys(PLACEHOLDERS).map((p) => `{${p}}`).join(' ');
    expect(parseCommandTemplate(`/bin/s ${all}`).ok).toBe(true);
  });
});

describe('registration requests', () => {
  it('takes the example and refuses text plans for weighted-split, bad names and control characters', () => {
    expect(ExternalSolverRequestSchema.safeParse(EXAMPLE_SOLVER).success).toBe(true);
    const base = { name: 'x', version: '1', models: ['classic'], command: '/bin/s {map} {scenario} {agents} {plan}' };
    expect(ExternalSolverRequestSchema.safeParse({ ...base, models: ['weighted-split'] }).success).toBe(false);
    expect(ExternalSolverRequestSchema.safeParse({ ...base, models: ['weighted-split'], planFormat: 'json' }).success).toBe(true);
    expect(ExternalSolverRequestSchema.safeParse({ ...base, name: 'Has Space' }).success).toBe(false);
    expect(ExternalSolverRequestSchema.safeParse({ ...base, command: `${base.command}\nrm -rf /` }).success).toBe(false);
    expect(ExternalSolverRequestSchema.safeParse({ ...base, command: `${base.command}\t--x` }).success).toBe(false);
  });

  it('reads name@version', () => {
    expect(parseSolverKey('prioritised-astar@1.0.0')).toEqual({ ok: true, ref: { name: 'prioritised-astar', version: '1.0.0' } });
    expect(parseSolverKey('no-version').ok).toBe(false);
    expect(parseSolverKey('@1').ok).toBe(false);
    expect(parseSolverKey('UPPER@1').ok).toBe(false);
  });
});
