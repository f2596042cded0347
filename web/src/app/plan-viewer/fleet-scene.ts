/**
 * Draws one frame of the fleet: the map from a bitmap made once, then every robot in the shape
 * and colour of what it is doing (ROBOT_STATE_STYLES: disk, square, ring, octagon, cross, so the
 * state reads without colour) with a heading tick (a turning robot's tick rotates; a blocked
 * robot's cross has none), and the collisions active at t as wide rings. Robots are drawn in one
 * path per state; nothing is allocated per frame.
 */
import type { CollisionView, ExecutionInstanceView } from '@shared/executions';
import type { RobotProfile } from '@shared/plan';
import { offscreenCanvas, type Context2dFactory } from './canvas-context';
import { FleetPoses } from './fleet-poses';
import type { FleetTrack } from './fleet-track';
import { ROBOT_STATE_STYLES, strokeWidth, traceRobot, type FleetPalette, type RobotStateStyle } from './viewer-palette';

type Ctx = CanvasRenderingContext2D | OffscreenCanvasRenderingContext2D;

/** How long a collision mark stays after the disks separate, ms of plan time. */
const COLLISION_LINGER_MS = 400;

/** Largest side of the scene's map bitmap, px (kept well under browsers' canvas limits). */
const SCENE_MAX_PX = 4096;

/** Scene pixels per cell: sharp up to 16 px per cell when zoomed in, the bitmap never over SCENE_MAX_PX a side (at least 2 px). */
export function sceneCellPixels(width: number, height: number): number {
  return Math.max(2, Math.min(16, Math.floor(SCENE_MAX_PX / Math.max(1, width, height))));
}

/** One map and one run, ready to draw at any t. */
export class FleetScene {
  private readonly map: HTMLCanvasElement | OffscreenCanvas;
  private readonly poses: FleetPoses | null;
  private readonly radiusPx: number;
  /** Look of each POSE_STATE code. */
  private readonly styles: readonly RobotStateStyle[];
  private readonly collisionX: Float32Array;
  private readonly collisionY: Float32Array;
  private readonly collisionFrom: Float64Array;
  private readonly collisionUntil: Float64Array;

  constructor(
    private readonly ctx: Ctx,
    private readonly instance: ExecutionInstanceView,
    track: FleetTrack | null,
    profile: RobotProfile,
    collisions: readonly CollisionView[],
    private readonly palette: FleetPalette,
    private readonly cell: number,
    makeContext: Context2dFactory,
  ) {
    this.map = drawMap(instance, palette, cell, makeContext);
    this.poses = track ? new FleetPoses(track) : null;
    this.radiusPx = (profile.robotDiameterMm / profile.cellPitchMm) * cell / 2;
    const styles: RobotStateStyle[] = [];
    for (const st of ROBOT_STATE_STYLES) styles[st.state] = st;
    this.styles = styles;
    const n = collisions.length;
    this.collisionX = Float32Array.from(collisions, (c) => c.at[0] / profile.cellPitchMm);
    this.collisionY = Float32Array.from(collisions, (c) => c.at[1] / profile.cellPitchMm);
    this.collisionFrom = Float64Array.from(collisions, (c) => c.timeMs);
    this.collisionUntil = new Float64Array(n);
    collisions.forEach((c, i) => { this.collisionUntil[i] = (c.untilMs ?? Infinity) + COLLISION_LINGER_MS; });
  }

  /** Draws the scene at `t` ms. */
  draw(t: number): void {
    const { ctx, cell } = this;
    ctx.drawImage(this.map, 0, 0);
    const poses = this.poses;
    if (!poses) return;
    poses.update(t);
    const half = cell / 2;
    const rad = this.radiusPx;
    const n = poses.track.robotCount;
    for (let s = 0; s < this.styles.length; s++) {
      const style = this.styles[s];
      ctx.beginPath();
      let any = false;
      for (let r = 0; r < n; r++) {
        if (poses.state[r] !== s) continue;
        traceRobot(ctx, style.shape, poses.x[r] * cell + half, poses.y[r] * cell + half, rad);
        any = true;
      }
      if (!any) continue;
      const line = strokeWidth(style.shape, rad);
      if (line > 0) {
        ctx.strokeStyle = style.colour;
        ctx.lineWidth = line;
        ctx.stroke();
      } else {
        ctx.fillStyle = style.colour;
        ctx.fill();
      }
      if (style.shape === 'cross') continue;
      // Heading ticks, centre to rim: white on the filled shapes, in the ring's colour inside a ring.
      ctx.beginPath();
      for (let r = 0; r < n; r++) {
        if (poses.state[r] !== s) continue;
        const cx = poses.x[r] * cell + half;
        const cy = poses.y[r] * cell + half;
        ctx.moveTo(cx, cy);
        ctx.lineTo(cx + Math.cos(poses.angle[r]) * rad, cy + Math.sin(poses.angle[r]) * rad);
      }
      ctx.strokeStyle = style.shape === 'ring' ? style.colour : this.palette.tick;
      ctx.lineWidth = Math.max(1, rad / 4);
      ctx.stroke();
    }
    // Collisions active at t (and for a moment after): rings around the contact point.
    ctx.beginPath();
    let hasCollision = false;
    for (let i = 0; i < this.collisionFrom.length; i++) {
      if (t < this.collisionFrom[i] || t > this.collisionUntil[i]) continue;
      const cx = this.collisionX[i] * cell + half;
      const cy = this.collisionY[i] * cell + half;
      ctx.moveTo(cx + rad * 1.6, cy);
      ctx.arc(cx, cy, rad * 1.6, 0, 2 * Math.PI);
      hasCollision = true;
    }
    if (hasCollision) {
      ctx.strokeStyle = this.palette.collision;
      ctx.lineWidth = Math.max(2, rad / 3);
      ctx.stroke();
    }
  }
}

/** The static layer: floor, walls, grid lines (when cells are large enough) and goal marks. */
function drawMap(instance: ExecutionInstanceView, palette: FleetPalette, cell: number, makeContext: Context2dFactory): HTMLCanvasElement | OffscreenCanvas {
  const w = instance.width * cell;
  const h = instance.height * cell;
  const canvas = offscreenCanvas(w, h);
  const ctx = makeContext(canvas);
  if (!ctx) return canvas;
  ctx.fillStyle = palette.floor;
  ctx.fillRect(0, 0, w, h);
  ctx.fillStyle = palette.wall;
  instance.rows.forEach((row, y) => {
    for (let x = 0; x < instance.width; x++) if (row[x] !== '.') ctx.fillRect(x * cell, y * cell, cell, cell);
  });
  if (cell >= 8) {
    ctx.beginPath();
    for (let x = 0; x <= instance.width; x++) {
      ctx.moveTo(x * cell + 0.5, 0);
      ctx.lineTo(x * cell + 0.5, h);
    }
    for (let y = 0; y <= instance.height; y++) {
      ctx.moveTo(0, y * cell + 0.5);
      ctx.lineTo(w, y * cell + 0.5);
    }
    ctx.strokeStyle = palette.gridLine;
    ctx.lineWidth = 1;
    ctx.stroke();
  }
  // Goals: a hollow square per robot, so a parked robot sits visibly on its own goal.
  ctx.strokeStyle = palette.goal;
  ctx.lineWidth = Math.max(1, cell / 10);
  const inset = cell * 0.2;
  for (const a of instance.agents) ctx.strokeRect(a.goal[0] * cell + inset, a.goal[1] * cell + inset, cell - 2 * inset, cell - 2 * inset);
  return canvas;
}
