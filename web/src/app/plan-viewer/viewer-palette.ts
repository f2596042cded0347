/**
 * Colours and patterns the canvases draw with. Map colours come from the Material theme's system
 * variables (read once from the page, so they follow styles.scss). Robot states and timeline
 * categories have Quarterturn's own fixed colours (issue 18, item 6): each has 3:1 contrast or
 * more against the light surfaces it is drawn on (WCAG 2.1, 1.4.11), every pair stays apart with
 * normal vision and under simulated protanopia, deuteranopia and tritanopia (thresholds and
 * simulation in core/colour-vision.ts), and none carries its meaning by colour alone: robots get a
 * shape per state, timeline bars a pattern (viewer-palette.spec.ts checks all of this).
 */
import type { GanttKind } from './gantt-layout';
import { POSE_STATE } from './fleet-poses';

/** Colours of the map and the collision marks. */
export interface FleetPalette {
  readonly floor: string;
  readonly wall: string;
  readonly gridLine: string;
  readonly goal: string;
  readonly tick: string;
  readonly collision: string;
}

/**
 * Timeline category colours (also the legend's). The robot on the map uses the same colour for
 * the same state: moving = forward, waiting on a dependency = held, at goal, stopped, blocked.
 */
export const GANTT_COLOURS: Readonly<Record<GanttKind, string>> = {
  forward: '#2a7de1',
  turn: '#e0613f',
  wait: '#a0809f',
  held: '#4a17d9',
  'at-goal': '#03676b',
  stopped: '#880044',
  blocked: '#444400',
};

/** A texture of white marks over a bar's colour. */
export type GanttPattern = 'solid' | 'stripes' | 'dots' | 'checks';

/**
 * Pattern of each timeline category. A 3:1 lightness step between all seven categories cannot fit
 * between 3:1 (against the background) and black, so the patterns carry the categories where the
 * colour does not: two categories share a pattern only when one is at least 1.5 times as light as
 * the other (relative luminance + 0.05, WCAG's ratio; a step that stays visible in greyscale,
 * common practice) and their colours pass the dichromacy check.
 */
export const GANTT_PATTERNS: Readonly<Record<GanttKind, GanttPattern>> = {
  forward: 'solid',
  turn: 'stripes',
  wait: 'dots',
  held: 'stripes',
  'at-goal': 'dots',
  stopped: 'solid',
  blocked: 'checks',
};

/** Side of one pattern tile, px. */
export const PATTERN_TILE_PX = 8;
/** The white marks of the patterns. */
const MARK = 'rgba(255, 255, 255, 0.7)';

/**
 * Traces the white marks of `pattern` on one PATTERN_TILE_PX tile (stripes and checks run
 * diagonally and continue across tile edges, so the tiles join without seams).
 */
export function tracePatternTile(ctx: Pick<CanvasPath, 'moveTo' | 'lineTo' | 'arc' | 'closePath'>, pattern: GanttPattern): void {
  const n = PATTERN_TILE_PX;
  // Rising lines run from (o, n) to (o + n, 0), falling ones from (o, 0) to (o + n, n); three per tile cover its corners.
  const diagonal = (rising: boolean) => {
    for (const o of [-n, 0, n]) {
      ctx.moveTo(o, rising ? n : 0);
      ctx.lineTo(o + n, rising ? 0 : n);
    }
  };
  if (pattern === 'stripes') diagonal(true);
  if (pattern === 'checks') { diagonal(true); diagonal(false); }
  if (pattern === 'dots') {
    for (const [x, y] of [[2, 2], [6, 6]]) {
      ctx.moveTo(x + 1.3, y);
      ctx.arc(x, y, 1.3, 0, 2 * Math.PI);
    }
  }
}

/** The fill of a timeline category: its colour with its pattern over it (the plain colour without a 2D context). */
export function ganttFill(
  kind: GanttKind,
  makeContext: (canvas: HTMLCanvasElement | OffscreenCanvas) => CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D | null,
  target: Pick<CanvasRenderingContext2D, 'createPattern'>,
  tile: HTMLCanvasElement | OffscreenCanvas,
): string | CanvasPattern {
  const colour = GANTT_COLOURS[kind];
  const pattern = GANTT_PATTERNS[kind];
  if (pattern === 'solid') return colour;
  const t = makeContext(tile);
  if (!t) return colour;
  t.fillStyle = colour;
  t.fillRect(0, 0, PATTERN_TILE_PX, PATTERN_TILE_PX);
  t.beginPath();
  tracePatternTile(t, pattern);
  if (pattern === 'dots') {
    t.fillStyle = MARK;
    t.fill();
  } else {
    t.strokeStyle = MARK;
    t.lineWidth = 1.5;
    t.stroke();
  }
  return target.createPattern(tile as CanvasImageSource, 'repeat') ?? colour;
}

/** The legend swatch of a timeline category as a CSS background (the same marks, drawn by CSS). */
export function ganttSwatch(kind: GanttKind): string {
  const colour = GANTT_COLOURS[kind];
  const stripes = (deg: number) => `repeating-linear-gradient(${deg}deg, ${MARK} 0 1.5px, transparent 1.5px 4px)`;
  switch (GANTT_PATTERNS[kind]) {
    case 'solid': return colour;
    case 'stripes': return `${stripes(-45)}, ${colour}`;
    case 'checks': return `${stripes(-45)}, ${stripes(45)}, ${colour}`;
    case 'dots': return `radial-gradient(circle, ${MARK} 0 1.3px, transparent 1.5px) 0 0 / 5px 5px, ${colour}`;
  }
}

/** How a robot in one state is drawn: its shape and colour, and the legend's words. */
export interface RobotStateStyle {
  readonly state: number;
  readonly label: string;
  readonly shape: 'disk' | 'square' | 'ring' | 'octagon' | 'cross';
  readonly colour: string;
}

/** Every robot state's look, in POSE_STATE order (the legend lists them all). */
export const ROBOT_STATE_STYLES: readonly RobotStateStyle[] = [
  { state: POSE_STATE.active, label: 'Moving as planned (driving, turning or waiting)', shape: 'disk', colour: GANTT_COLOURS.forward },
  { state: POSE_STATE.held, label: 'Waiting on dependency', shape: 'square', colour: GANTT_COLOURS.held },
  { state: POSE_STATE.done, label: 'At goal', shape: 'ring', colour: GANTT_COLOURS['at-goal'] },
  { state: POSE_STATE.stopped, label: 'Stopped by collision', shape: 'octagon', colour: GANTT_COLOURS.stopped },
  { state: POSE_STATE.blocked, label: 'Blocked (dependency cycle)', shape: 'cross', colour: GANTT_COLOURS.blocked },
];

/**
 * Traces one robot of `shape` at (cx, cy) with radius r. Disk, square and octagon are filled; ring
 * and cross are stroked (their line width is strokeWidth(shape, r)).
 */
export function traceRobot(ctx: Pick<CanvasPath, 'moveTo' | 'lineTo' | 'arc' | 'closePath'>, shape: RobotStateStyle['shape'], cx: number, cy: number, r: number): void {
  switch (shape) {
    case 'disk':
      ctx.moveTo(cx + r, cy);
      ctx.arc(cx, cy, r, 0, 2 * Math.PI);
      return;
    case 'ring': {
      const rr = r - strokeWidth('ring', r) / 2;
      ctx.moveTo(cx + rr, cy);
      ctx.arc(cx, cy, rr, 0, 2 * Math.PI);
      return;
    }
    case 'square': {
      const h = r * 0.86;
      ctx.moveTo(cx - h, cy - h);
      ctx.lineTo(cx + h, cy - h);
      ctx.lineTo(cx + h, cy + h);
      ctx.lineTo(cx - h, cy + h);
      ctx.closePath();
      return;
    }
    case 'octagon':
      for (let k = 0; k < 8; k++) {
        const a = ((k + 0.5) * Math.PI) / 4;
        if (k === 0) ctx.moveTo(cx + r * Math.cos(a), cy + r * Math.sin(a));
        else ctx.lineTo(cx + r * Math.cos(a), cy + r * Math.sin(a));
      }
      ctx.closePath();
      return;
    case 'cross': {
      const h = r * 0.75;
      ctx.moveTo(cx - h, cy - h);
      ctx.lineTo(cx + h, cy + h);
      ctx.moveTo(cx + h, cy - h);
      ctx.lineTo(cx - h, cy + h);
      return;
    }
  }
}

/** Line width of a stroked robot shape of radius r, px (0 for filled shapes). */
export function strokeWidth(shape: RobotStateStyle['shape'], r: number): number {
  if (shape === 'ring') return Math.max(1.5, r / 3);
  if (shape === 'cross') return Math.max(2, r / 2.2);
  return 0;
}

/** Fallbacks when the theme variables cannot be read (tests, very old browsers). */
const FALLBACK: FleetPalette = {
  floor: '#f7fdfe', wall: '#2c4b51', gridLine: '#d7e1e3', goal: '#1f6f8b', tick: '#ffffff', collision: '#c62f3a',
};

/**
 * The fleet palette from the theme variables at `host` (falls back per colour). Read through a
 * probe's computed colour: the variables hold light-dark() expressions a canvas cannot parse.
 */
export function fleetPalette(host: HTMLElement | null): FleetPalette {
  if (!host || typeof getComputedStyle !== 'function') return FALLBACK;
  const pick = (name: string, fallback: string): string => {
    const probe = document.createElement('span');
    probe.style.color = `var(${name})`;
    probe.style.display = 'none';
    host.appendChild(probe);
    const colour = getComputedStyle(probe).color;
    probe.remove();
    return /^rgba?\(/.test(colour) ? colour : fallback;
  };
  return {
    ...FALLBACK,
    floor: pick('--mat-sys-surface-container-lowest', FALLBACK.floor),
    wall: pick('--mat-sys-on-surface-variant', FALLBACK.wall),
    gridLine: pick('--mat-sys-outline-variant', FALLBACK.gridLine),

    collision: pick('--mat-sys-error', FALLBACK.collision),
  };
}
