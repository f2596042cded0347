/** A small preview of a map: the whole map scaled into a square canvas, drawn once. */
import { ChangeDetectionStrategy, Component, ElementRef, afterRenderEffect, inject, input, viewChild } from '@angular/core';
import { CanvasHost } from './canvas-host';
import { paintMap } from './map-bitmap';
import { fitTransform } from './map-view-math';

/** Side of the preview in CSS pixels. */
const SIDE = 112;

/** The preview canvas of one map. */
@Component({
  selector: 'app-map-thumbnail',
  template: `<canvas #canvas [width]="side" [height]="side" role="img" [attr.aria-label]="'Preview of ' + label()"></canvas>`,
  styles: ':host { display: block; line-height: 0; } canvas { width: 7rem; height: 7rem; background: var(--mat-sys-surface-container); border-radius: var(--mat-sys-corner-extra-small); }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class MapThumbnail {
  private readonly host = inject(CanvasHost);
  private readonly element = inject<ElementRef<HTMLElement>>(ElementRef);
  private readonly canvasRef = viewChild.required<ElementRef<HTMLCanvasElement>>('canvas');
  protected readonly side = SIDE;
  readonly rows = input.required<readonly string[]>();
  readonly mapWidth = input.required<number>();
  readonly mapHeight = input.required<number>();
  /** What the preview shows, for screen readers. */
  readonly label = input('the map');

  constructor() {
    afterRenderEffect(() => {
      const [rows, width, height] = [this.rows(), this.mapWidth(), this.mapHeight()];
      const canvas = this.canvasRef().nativeElement;
      const ctx = this.host.context2d(canvas);
      const bitmap = document.createElement('canvas');
      bitmap.width = width;
      bitmap.height = height;
      const bctx = this.host.context2d(bitmap);
      if (!ctx || !bctx) return;
      const image = bctx.createImageData(width, height);
      image.data.set(paintMap(rows, width, height, this.host.palette(this.element.nativeElement)));
      bctx.putImageData(image, 0, 0);
      const t = fitTransform(width, height, SIDE, SIDE, 2);
      ctx.clearRect(0, 0, SIDE, SIDE);
      // Smoothing on when shrinking, so a large map averages into grey instead of aliasing.
      ctx.imageSmoothingEnabled = t.scale < 1;
      ctx.drawImage(bitmap, t.offsetX, t.offsetY, width * t.scale, height * t.scale);
    });
  }
}
