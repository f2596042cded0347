/**
 * The Help page at /help: the user's guide (README.md's guide part, served by GET /api/help/guide)
 * rendered from Markdown, with a contents list and the links to the published JSON Schemas.
 */
import { ChangeDetectionStrategy, Component, ElementRef, ViewEncapsulation, computed, inject, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { Router, RouterLink } from '@angular/router';
import { catchError, map, of } from 'rxjs';
import { schemaUrl } from '@shared/help';
import { GuideApi } from './guide-api';
import { renderGuide, type RenderedGuide } from './render-guide';

/** The schema links at the top of the page. */
const SCHEMA_LINKS = [
  { label: 'Plan format JSON Schema', href: schemaUrl('plan-format.schema.json') },
  { label: 'Instance format JSON Schema', href: schemaUrl('instance-format.schema.json') },
] as const;

/** The page at `/help`. */
@Component({
  selector: 'app-help-page',
  templateUrl: './help-page.html',
  styleUrl: './help-page.scss',
  imports: [RouterLink],
  // The guide's elements come from [innerHTML], which emulated encapsulation cannot reach; every rule is scoped to app-help-page.
  encapsulation: ViewEncapsulation.None,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class HelpPage {
  private readonly api = inject(GuideApi);
  private readonly router = inject(Router);
  private readonly article = viewChild<ElementRef<HTMLElement>>('article');
  protected readonly schemaLinks = SCHEMA_LINKS;
  /** undefined while loading, null when the request failed (the snack bar said why). */
  protected readonly guide = toSignal<RenderedGuide | null>(this.api.guide().pipe(map(renderGuide), catchError(() => of(null))));
  /** Whether the guide has arrived. */
  protected readonly isLoaded = computed(() => this.guide() !== undefined);

  /** Scrolls to the guide's `index`-th `##` section and moves the focus there. */
  protected showSection(index: number): void {
    const heading = this.article()?.nativeElement.querySelectorAll('h2').item(index);
    if (!heading) return;
    heading.setAttribute('tabindex', '-1');
    heading.scrollIntoView({ block: 'start' });
    heading.focus({ preventScroll: true });
  }

  /** Follows links to pages of this app with the router instead of reloading the app (API URLs load as usual). */
  protected followLink(event: MouseEvent): void {
    if (event.button !== 0 || event.ctrlKey || event.metaKey || event.shiftKey || event.altKey) return;
    const href = (event.target as Element | null)?.closest('a')?.getAttribute('href');
    if (!href || !href.startsWith('/') || href.startsWith('//') || href.startsWith('/api/')) return;
    event.preventDefault();
    void this.router.navigateByUrl(href);
  }
}
