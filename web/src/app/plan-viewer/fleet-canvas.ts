/** The fleet replay canvas of one pane: map once, robots every frame of the shared clock. */
import { ChangeDetectionStrategy, Component, ElementRef, computed, effect, inject, input, viewChild } from '@angular/core';
import type { CollisionView, ExecutionInstanceView } from '@shared/executions';
import type { RobotProfile } from '@shared/plan';
import { CONTEXT_2D } from './canvas-context';
import { cellPixels, FleetScene } from './fleet-scene';
import type { FleetTrack } from './fleet-track';
import type { ReplayClock } from './replay-clock';
import { fleetPalette } from './viewer-palette';

/** Canvas showing one run of the fleet at the clock's time. */
@Component({
  selector: 'app-fleet-canvas',
  template: `<canvas #canvas role="img" [attr.aria-label]="label()" [style.width.px]="size().w" [style.height.px]="size().h"></canvas>`,
  styles: [':host { display: block; } canvas { display: block; max-width: 100%; border-radius: var(--mat-sys-corner-small); }'],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FleetCanvas {
  private readonly makeContext = inject(CONTEXT_2D);
  private readonly host = inject<ElementRef<HTMLElement>>(ElementRef);
  readonly instance = input.required<ExecutionInstanceView>();
  readonly track = input<FleetTrack | null>(null);
  readonly profile = input.required<RobotProfile>();
  readonly collisions = input<readonly CollisionView[]>([]);
  readonly clock = input.required<ReplayClock>();
  /** Largest side of the drawing, CSS px. */
  readonly maxPx = input(560);
  readonly label = input('Fleet replay');
  private readonly canvas = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  protected readonly cell = computed(() => cellPixels(this.instance().width, this.instance().height, this.maxPx()));
  protected readonly size = computed(() => ({ w: this.instance().width * this.cell(), h: this.instance().height * this.cell() }));

  constructor() {
    effect((onCleanup) => {
      const canvas = this.canvas().nativeElement;
      const { w, h } = this.size();
      canvas.width = w;
      canvas.height = h;
      const ctx = this.makeContext(canvas);
      if (!ctx) return;
      const scene = new FleetScene(ctx, this.instance(), this.track(), this.profile(), this.collisions(),
        fleetPalette(this.host.nativeElement), this.cell(), this.makeContext);
      onCleanup(this.clock().onFrame((t) => scene.draw(t)));
    });
  }
}
