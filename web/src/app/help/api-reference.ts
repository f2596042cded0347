/**
 * The API reference at /help/api (issue 16, item 2): GET /api/openapi.json rendered by Swagger UI
 * (swagger-ui-dist, bundled from npm and loaded only on this page). It fits the app's
 * Content-Security-Policy (api/src/http/security-headers.ts): its script is a same-origin chunk,
 * its stylesheet a same-origin file (copied by angular.json's assets; loaded here, so it is not
 * part of the start-up bundle), its icons data: URLs, no validator badge from another site
 * (`validatorUrl: null`) and no "try it out" console (state-changing calls need a token or the
 * CSRF header; scripts use a token, see Help "Scripting the API").
 */
import { ChangeDetectionStrategy, Component, ElementRef, afterNextRender, signal, viewChild } from '@angular/core';
import { RouterLink } from '@angular/router';

/** Where the document is served. */
export const OPENAPI_URL = '/api/openapi.json';

/** Where angular.json's assets put Swagger UI's stylesheet. */
export const SWAGGER_UI_CSS = '/swagger-ui/swagger-ui.css';

const STYLESHEET_ID = 'qt-swagger-ui-css';

/** Adds Swagger UI's stylesheet once per page load (its rules are all under `.swagger-ui`). */
function addStylesheet(): void {
  if (document.getElementById(STYLESHEET_ID)) return;
  const link = document.createElement('link');
  link.id = STYLESHEET_ID;
  link.rel = 'stylesheet';
  link.href = SWAGGER_UI_CSS;
  document.head.append(link);
}

/** The page at `/help/api`. */
@Component({
  selector: 'app-api-reference',
  template: `
    <header class="head">
      <h1>API reference</h1>
      <p>
        Every route of the Quarterturn API with the role it needs and the API token scope that opens it, generated from
        the schemas that check requests. Scripts authenticate with a personal token from
        <a routerLink="/account/tokens">API tokens</a> (account menu); the <a routerLink="/help">Help</a> page's
        "Scripting the API" has an example. The document itself: <a [href]="openApiUrl">openapi.json</a> (OpenAPI 3.1).
      </p>
    </header>
    @if (!isReady()) { <p class="muted" aria-live="polite">Loading the reference…</p> }
    <div #reference class="reference" data-testid="api-reference"></div>
  `,
  styles: `
    :host { display: block; max-width: 72rem; margin: 0 auto; }
    h1 { font: var(--mat-sys-headline-small); margin: 0.5rem 0; }
    .muted { color: var(--mat-sys-on-surface-variant); }
    .reference { background: var(--mat-sys-surface-container-lowest); border-radius: var(--mat-sys-corner-small); }
  `,
  imports: [RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ApiReference {
  private readonly reference = viewChild.required<ElementRef<HTMLElement>>('reference');
  protected readonly openApiUrl = OPENAPI_URL;
  /** Whether Swagger UI has drawn the document. */
  protected readonly isReady = signal(false);

  constructor() {
    afterNextRender(() => {
      addStylesheet();
      // Loaded here, not at start-up: the renderer is large and only this page needs it.
      void import('swagger-ui-dist/swagger-ui-es-bundle.js').then(({ default: SwaggerUI }) => {
        SwaggerUI({
          domNode: this.reference().nativeElement,
          url: OPENAPI_URL,
          validatorUrl: null,
          supportedSubmitMethods: [],
          deepLinking: false,
          docExpansion: 'list',
          defaultModelsExpandDepth: -1,
          defaultModelExpandDepth: 2,
          displayRequestDuration: false,
          filter: true,
          showExtensions: true,
          onComplete: () => this.isReady.set(true),
        });
      });
    });
  }
}
