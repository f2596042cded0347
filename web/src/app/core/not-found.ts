/** Page for addresses the app does not know. */
import { ChangeDetectionStrategy, Component } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';

/** Says the page does not exist and offers the way back. */
@Component({
  selector: 'app-not-found',
  template: `
    <section class="notice" aria-labelledby="not-found-title">
      <h1 id="not-found-title">No such page</h1>
      <p>Nothing lives at this address. It may have moved, or the link may be mistyped.</p>
      <div class="actions"><a mat-stroked-button routerLink="/">Back to the start page</a></div>
    </section>
  `,
  styleUrl: './notice-page.scss',
  imports: [MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class NotFound {}
