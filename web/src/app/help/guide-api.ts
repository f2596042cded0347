/** HTTP call for the Help page: the user's guide as Markdown. */
import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { Observable } from 'rxjs';
import { HELP_GUIDE_PATH } from '@shared/help';

/** Owns GET /api/help/guide. */
@Injectable({ providedIn: 'root' })
export class GuideApi {
  private readonly http = inject(HttpClient);

  /** The user's guide, the guide part of README.md, as Markdown text. */
  guide(): Observable<string> {
    return this.http.get(HELP_GUIDE_PATH, { responseType: 'text' });
  }
}
