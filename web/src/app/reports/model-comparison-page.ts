/**
 * The plan model comparison: for one instance set × robot profile × execution policy (query
 * parameters `set`, `profile`, `policy`, so a report can be linked), the sentences the API
 * generates from the figures, one row per plan model variant, the methods, the safety note and
 * Markdown / LaTeX downloads.
 */
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatSelectModule } from '@angular/material/select';
import { ActivatedRoute, Router } from '@angular/router';
import { MIXED_SETTINGS_NOTE, REPORT_POLICIES, REPORT_TABLE_HEADERS, reportTableRows } from '@shared/reports';
import { SAFETY_NOTE } from '@shared/executions-constants';
import { errorMessage } from '../core/error-message';
import { ReportApi, type ReportScope } from './report-api';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';

/** Policy when the link names none (same default as the API). */
const DEFAULT_POLICY = 'dependency-gated';

@Component({
  selector: 'app-model-comparison-page',
  templateUrl: './model-comparison-page.html',
  styleUrl: './model-comparison-page.scss',
  imports: [MiddleEllipsisPipe, MatButtonModule, MatFormFieldModule, MatSelectModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ModelComparisonPage {
  private readonly api = inject(ReportApi);
  private readonly router = inject(Router);
  private readonly route = inject(ActivatedRoute);

  /** Query parameters (bound by the router). */
  readonly set = input<string>();
  readonly profile = input<string>();
  readonly policy = input<string>();

  protected readonly choices = rxResource({ stream: () => this.api.choices() });
  protected readonly policies = REPORT_POLICIES;
  protected readonly headers = REPORT_TABLE_HEADERS;
  protected readonly safetyNote = SAFETY_NOTE;
  /** ms as whole ms ("–" for none), for the field-trials table. */
  protected msText(ms: number | null): string {
    return ms === null ? '–' : `${Math.round(ms)} ms`;
  }
  protected readonly mixedSettingsNote = MIXED_SETTINGS_NOTE;

  // hasValue() first: reading value() of a resource in its error state throws.
  protected readonly sets = computed(() => (this.choices.hasValue() ? this.choices.value().sets : []));
  protected readonly chosenSet = computed(() => {
    const id = Number(this.set());
    return this.sets().find((s) => s.id === id) ?? this.sets().at(0) ?? null;
  });
  protected readonly profiles = computed(() => this.chosenSet()?.profiles ?? []);
  protected readonly chosenProfile = computed(() => this.profiles().find((p) => p.hash === this.profile()) ?? this.profiles().at(0) ?? null);
  protected readonly chosenPolicy = computed(() => this.policy() ?? DEFAULT_POLICY);

  /** What the report is for, once the choices are known. */
  protected readonly scope = computed<ReportScope | undefined>(() => {
    const set = this.chosenSet();
    const profile = this.chosenProfile();
    return set && profile ? { set: set.id, profile: profile.hash, policy: this.chosenPolicy() } : undefined;
  });

  protected readonly report = rxResource({ params: () => this.scope(), stream: ({ params }) => this.api.modelComparison(params) });
  /** The report, or null while loading or after a refusal. */
  protected readonly shown = computed(() => (this.report.hasValue() ? this.report.value() : null));
  protected readonly rows = computed(() => {
    const r = this.shown();
    return r ? reportTableRows(r) : [];
  });
  /** The server's sentence when the report failed (a resource wraps a non-Error failure in `cause`). */
  protected readonly reportError = computed(() => {
    const err = this.report.error();
    return err ? errorMessage((err as { cause?: unknown }).cause ?? err) : null;
  });
  protected readonly exports = computed(() => {
    const scope = this.scope();
    return scope ? [
      { id: 'markdown', label: 'Markdown', href: this.api.exportUrl(scope, 'markdown') },
      { id: 'latex', label: 'LaTeX', href: this.api.exportUrl(scope, 'latex') },
    ] : [];
  });

  /** Changes one choice in the URL (a new set drops the profile: profiles belong to a set). */
  protected choose(name: 'set' | 'profile' | 'policy', value: string | number): void {
    const queryParams = name === 'set' ? { set: value, profile: null } : { [name]: value };
    void this.router.navigate([], { relativeTo: this.route, queryParams, queryParamsHandling: 'merge', replaceUrl: true });
  }
}
