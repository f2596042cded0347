/**
 * Robot states and timeline categories are told apart by shape and pattern as well as colour, and
 * their colours stay apart for common colour-vision deficiencies with 3:1 contrast against the
 * surfaces they are drawn on (issue 18, item 6).
 */
import { TestBed } from '@angular/core/testing';
import { closestPairs, contrastRatio, DICHROMACIES, MIN_DISTANCE_NORMAL, MIN_DISTANCE_SIMULATED, MIN_NON_TEXT_CONTRAST, relativeLuminance } from '../core/colour-vision';
import { CONTEXT_2D } from './canvas-context';
import { POSE_STATE } from './fleet-poses';
import { GanttChart } from './gantt-chart';
import { GANTT_KINDS, type GanttSegments } from './gantt-layout';
import { ReplayClock } from './replay-clock';
import { GANTT_COLOURS, GANTT_PATTERNS, ganttSwatch, ROBOT_STATE_STYLES, strokeWidth, tracePatternTile, traceRobot } from './viewer-palette';

/** The light surfaces the map floor and the timeline lie on: white (surface-container-lowest) and neutral 98 (surface, _palette.scss). */
const BACKGROUNDS = ['#ffffff', '#f7fafa'];

/** Records path calls, for comparing traced shapes. */
function recorder() {
  const calls: string[] = [];
  const at = (name: string) => (...args: (number | boolean | undefined)[]) => { calls.push(`${name}(${args.map((a) => (typeof a === 'number' ? +a.toFixed(2) : a)).join(',')})`); };
  return { calls, path: { moveTo: at('moveTo'), lineTo: at('lineTo'), arc: at('arc'), closePath: at('closePath') } };
}

function expectApart(colours: readonly string[]): void {
  const worst = closestPairs(colours);
  expect({ normal: worst.normal.distance >= MIN_DISTANCE_NORMAL, pair: worst.normal.pair }).toEqual({ normal: true, pair: worst.normal.pair });
  for (const kind of DICHROMACIES) expect({ kind, ok: worst[kind].distance >= MIN_DISTANCE_SIMULATED, pair: worst[kind].pair }).toEqual({ kind, ok: true, pair: worst[kind].pair });
}

describe('robot state looks', () => {
  it('has a look for every pose state, blocked included, each with its own shape', () => {
    expect(ROBOT_STATE_STYLES.map((s) => s.state)).toEqual(Object.values(POSE_STATE));
    expect(new Set(ROBOT_STATE_STYLES.map((s) => s.shape)).size).toBe(ROBOT_STATE_STYLES.length);
  });

  it('traces a different outline for every shape, stroking the ring and the cross', () => {
    const traces = ROBOT_STATE_STYLES.map((s) => {
      const r = recorder();
      traceRobot(r.path, s.shape, 10, 10, 6);
      return r.calls.join(' ');
    });
    expect(new Set(traces).size).toBe(ROBOT_STATE_STYLES.length);
    expect(traces[ROBOT_STATE_STYLES.findIndex((s) => s.shape === 'octagon')].match(/lineTo/g)).toHaveLength(7);
    expect(ROBOT_STATE_STYLES.filter((s) => strokeWidth(s.shape, 6) > 0).map((s) => s.shape)).toEqual(['ring', 'cross']);
  });

  it('colours the states apart under every simulated dichromacy, each 3:1 against the floor', () => {
    expectApart(ROBOT_STATE_STYLES.map((s) => s.colour));
    let compared = 0;
    for (const s of ROBOT_STATE_STYLES) {
      for (const bg of BACKGROUNDS) {
        expect({ state: s.label, bg, ok: contrastRatio(s.colour, bg) >= MIN_NON_TEXT_CONTRAST }).toEqual({ state: s.label, bg, ok: true });
        compared++;
      }
    }
    expect(compared).toBe(10);
  });
});

describe('timeline category looks', () => {
  it('gives every category, at goal, wait and turn included, 3:1 contrast against the background', () => {
    let compared = 0;
    for (const k of GANTT_KINDS) {
      for (const bg of BACKGROUNDS) {
        expect({ k, bg, ok: contrastRatio(GANTT_COLOURS[k], bg) >= MIN_NON_TEXT_CONTRAST }).toEqual({ k, bg, ok: true });
        compared++;
      }
    }
    expect(compared).toBe(14);
  });

  it('keeps the category colours apart under every simulated dichromacy', () => {
    expectApart(GANTT_KINDS.map((k) => GANTT_COLOURS[k]));
  });

  it('lets two categories share a pattern only when one is at least 1.5 times as light as the other', () => {
    let shared = 0;
    for (const a of GANTT_KINDS) {
      for (const b of GANTT_KINDS) {
        if (a >= b || GANTT_PATTERNS[a] !== GANTT_PATTERNS[b]) continue;
        const la = relativeLuminance(GANTT_COLOURS[a]) + 0.05;
        const lb = relativeLuminance(GANTT_COLOURS[b]) + 0.05;
        expect({ a, b, ok: Math.max(la, lb) / Math.min(la, lb) >= 1.5 }).toEqual({ a, b, ok: true });
        shared++;
      }
    }
    expect(shared).toBe(3);
  });

  it('traces the marks of each pattern differently, and shows them in the legend swatches', () => {
    const traces = (['stripes', 'dots', 'checks'] as const).map((p) => {
      const r = recorder();
      tracePatternTile(r.path, p);
      return r.calls.join(' ');
    });
    expect(new Set(traces).size).toBe(3);
    TestBed.configureTestingModule({ providers: [{ provide: CONTEXT_2D, useValue: () => null }] });
    const fixture = TestBed.createComponent(GanttChart);
    const none: GanttSegments = { count: 0, robot: new Int32Array(0), kind: new Uint8Array(0), t0: new Float64Array(0), t1: new Float64Array(0), horizonMs: 1000 };
    fixture.componentRef.setInput('segments', none);
    fixture.componentRef.setInput('robotCount', 2);
    fixture.componentRef.setInput('clock', new ReplayClock());
    fixture.detectChanges();
    const items = [...(fixture.nativeElement as HTMLElement).querySelectorAll<HTMLElement>('.legend li[data-kind]')];
    expect(items.map((li) => li.dataset['kind'])).toEqual([...GANTT_KINDS]);
    for (const li of items) {
      const kind = li.dataset['kind'] as (typeof GANTT_KINDS)[number];
      expect(li.dataset['pattern']).toBe(GANTT_PATTERNS[kind]);
      expect(ganttSwatch(kind).includes('gradient')).toBe(GANTT_PATTERNS[kind] !== 'solid');
      // jsdom keeps the background shorthand only if it parses; a pattern swatch names a gradient.
      const bg = li.querySelector<HTMLElement>('.swatch')?.style.background ?? '';
      if (GANTT_PATTERNS[kind] !== 'solid' && bg !== '') expect(bg).toContain('gradient');
    }
  });
});
