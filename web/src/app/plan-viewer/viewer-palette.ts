/**
 * Colours the canvases draw with. Map and robot colours come from the Material theme's system
 * variables (read once from the page, so they follow styles.scss); the Gantt categories have
 * their own fixed colours, chosen to stay apart for common colour-vision deficiencies
 * (blue/orange/purple pairs; common practice) and listed in the legend.
 */
import type { GanttKind } from './gantt-layout';

/** Colours of the map and the fleet. */
export interface FleetPalette {
  readonly floor: string;
  readonly wall: string;
  readonly gridLine: string;
  readonly goal: string;
  readonly robot: string;
  readonly robotHeld: string;
  readonly robotDone: string;
  readonly robotStopped: string;
  readonly robotBlocked: string;
  readonly tick: string;
  readonly collision: string;
}

/** Gantt category colours (also used by the legend). */
export const GANTT_COLOURS: Readonly<Record<GanttKind, string>> = {
  forward: '#1f6f8b',
  turn: '#e0902f',
  wait: '#a9b6bd',
  held: '#7e57c2',
  'at-goal': '#dde4e6',
  stopped: '#c62f3a',
  blocked: '#3d3d46',
};

/** Fallbacks when the theme variables cannot be read (tests, very old browsers). */
const FALLBACK: FleetPalette = {
  floor: '#f7fdfe', wall: '#2c4b51', gridLine: '#d7e1e3', goal: '#1f6f8b', robot: '#036971', robotHeld: '#7e57c2',
  robotDone: '#8aa0a6', robotStopped: '#c62f3a', robotBlocked: '#3d3d46', tick: '#ffffff', collision: '#c62f3a',
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
    robot: pick('--mat-sys-primary', FALLBACK.robot),
    tick: pick('--mat-sys-on-primary', FALLBACK.tick),
    collision: pick('--mat-sys-error', FALLBACK.collision),
  };
}
