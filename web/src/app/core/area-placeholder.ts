/** Frame for an area whose pages are still being built. */
import { ChangeDetectionStrategy, Component, input } from '@angular/core';

/** Shows the area's heading and a short account of what the area will hold (projected content). */
@Component({
  selector: 'app-area-placeholder',
  template: `
    <section class="notice" [attr.aria-label]="heading()">
      <h1>{{ heading() }}</h1>
      <ng-content />
      <p class="soon">This area is being built.</p>
    </section>
  `,
  styleUrl: './notice-page.scss',
  styles: '.soon { color: var(--mat-sys-on-surface-variant); font: var(--mat-sys-body-small); }',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class AreaPlaceholder {
  /** The area's name. */
  readonly heading = input.required<string>();
}
