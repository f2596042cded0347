/**
 * The shared clock of the plan viewer: play / pause / speed / seek, one requestAnimationFrame
 * loop for every canvas on the page (side-by-side panes share it, so they stay in step). Frame
 * listeners get the time every frame; the `timeMs` signal the template shows is refreshed at
 * most every 100 ms, so change detection does not run 60 times a second.
 */
import { signal } from '@angular/core';

/** A frame listener: draws the scene at `t` ms. */
export type FrameListener = (t: number) => void;

/** Speeds the viewer offers, × real time. */
export const REPLAY_SPEEDS: readonly number[] = [0.25, 0.5, 1, 2, 4, 8];

/** How often the shown time refreshes while playing, ms of wall time. */
const SIGNAL_INTERVAL_MS = 100;

/** Clock with play/pause, speed and seek, driving frame listeners. */
export class ReplayClock {
  private readonly timeSignal = signal(0);
  private readonly playing = signal(false);
  private readonly speedSignal = signal(1);
  private readonly horizonSignal = signal(0);
  /** Plan time, ms (refreshed every 100 ms while playing; exact after pause and seek). */
  readonly timeMs = this.timeSignal.asReadonly();
  /** Whether the clock runs. */
  readonly isPlaying = this.playing.asReadonly();
  /** × real time. */
  readonly speed = this.speedSignal.asReadonly();
  /** End of the longest shown run, ms. */
  readonly horizonMs = this.horizonSignal.asReadonly();

  private t = 0;
  private listeners: FrameListener[] = [];
  private frame: number | null = null;
  private lastWall = 0;
  private lastSignal = 0;

  constructor(
    private readonly requestFrame: (cb: (wall: number) => void) => number = defaultRequestFrame,
    private readonly cancelFrame: (id: number) => void = defaultCancelFrame,
  ) {}

  /** Adds a listener and draws it once at the current time; returns its removal. */
  onFrame(listener: FrameListener): () => void {
    this.listeners.push(listener);
    listener(this.t);
    return () => {
      this.listeners = this.listeners.filter((l) => l !== listener);
    };
  }

  /** Sets the end of the timeline (the clock stops there). */
  setHorizon(ms: number): void {
    this.horizonSignal.set(ms);
    if (this.t > ms) this.seek(ms);
  }

  /** Starts playing (from 0 when at the end). */
  play(): void {
    if (this.playing()) return;
    if (this.t >= this.horizonSignal()) this.seek(0);
    this.playing.set(true);
    this.lastWall = -1;
    this.frame = this.requestFrame((wall) => this.tick(wall));
  }

  /** Pauses where it is. */
  pause(): void {
    this.playing.set(false);
    if (this.frame !== null) this.cancelFrame(this.frame);
    this.frame = null;
    this.timeSignal.set(this.t);
  }

  /** Jumps to `ms` (clamped to the timeline) and redraws. */
  seek(ms: number): void {
    this.t = Math.max(0, Math.min(ms, this.horizonSignal()));
    this.timeSignal.set(this.t);
    this.emit();
  }

  /** Sets the speed. */
  setSpeed(speed: number): void {
    this.speedSignal.set(speed);
  }

  /** Redraws every listener at the current time (after data changed). */
  redraw(): void {
    this.emit();
  }

  /** Stops the loop for good. */
  destroy(): void {
    this.pause();
    this.listeners = [];
  }

  private tick(wall: number): void {
    if (!this.playing()) return;
    if (this.lastWall >= 0) this.t += (wall - this.lastWall) * this.speedSignal();
    this.lastWall = wall;
    const end = this.horizonSignal();
    if (this.t >= end) {
      this.t = end;
      this.emit();
      this.pause();
      return;
    }
    this.emit();
    if (wall - this.lastSignal >= SIGNAL_INTERVAL_MS) {
      this.lastSignal = wall;
      this.timeSignal.set(this.t);
    }
    this.frame = this.requestFrame((w) => this.tick(w));
  }

  private emit(): void {
    for (const l of this.listeners) l(this.t);
  }
}

function defaultRequestFrame(cb: (wall: number) => void): number {
  return typeof requestAnimationFrame === 'function' ? requestAnimationFrame(cb) : (setTimeout(() => cb(performance.now()), 16) as unknown as number);
}

function defaultCancelFrame(id: number): void {
  if (typeof cancelAnimationFrame === 'function') cancelAnimationFrame(id);
  else clearTimeout(id);
}
