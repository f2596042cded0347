/**
 * Asks before an instance set, map or scenario is deleted, saying what goes with it (its maps and
 * scenarios, the results and submitted plans over them, sweep runs). Closes with true when the
 * person confirms; the page deletes.
 */
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { rxResource } from '@angular/core/rxjs-interop';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialogModule } from '@angular/material/dialog';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { deletionConsequences } from './deletion-consequences';
import { InstanceSetApi } from './instance-set-api';

/** Which file the dialog asks about. */
export interface DeletionTarget {
  readonly kind: 'instance-sets' | 'maps' | 'scenarios';
  readonly id: number;
  readonly name: string;
}

/** The confirmation dialog; `afterClosed()` gives true to delete. */
@Component({
  selector: 'app-deletion-dialog',
  template: `
    <h2 mat-dialog-title>Delete {{ noun }} “{{ target.name }}”?</h2>
    <mat-dialog-content>
      @if (preview.value(); as p) {
        @if (consequences().length > 0) {
          <p>This also deletes:</p>
          <ul class="goes" aria-label="Deleted with it">
            @for (line of consequences(); track line) { <li>{{ line }}</li> }
          </ul>
        } @else {
          <p>Nothing else goes with it: no {{ p.kind === 'scenario' ? '' : 'map, scenario, ' }}result, submitted plan or sweep run uses it.</p>
        }
        <p><strong>This cannot be undone.</strong></p>
      } @else if (preview.error()) {
        <p role="alert">Could not find out what goes with it; nothing was deleted.</p>
      } @else {
        <mat-progress-bar mode="indeterminate" aria-label="Finding out what goes with it" />
      }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" [mat-dialog-close]="false">Keep it</button>
      <button mat-flat-button type="button" class="is-danger" [disabled]="!preview.value()" [mat-dialog-close]="true">Delete {{ noun }}</button>
    </mat-dialog-actions>
  `,
  styles: '.goes { margin: 0 0 0.5rem; } .is-danger { --mat-button-filled-container-color: var(--mat-sys-error); --mat-button-filled-label-text-color: var(--mat-sys-on-error); }',
  imports: [MatDialogModule, MatButtonModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class DeletionDialog {
  private readonly api = inject(InstanceSetApi);
  protected readonly target = inject<DeletionTarget>(MAT_DIALOG_DATA);
  protected readonly noun = { 'instance-sets': 'instance set', maps: 'map', scenarios: 'scenario' }[this.target.kind];
  protected readonly preview = rxResource({ stream: () => this.api.deletionPreview(this.target.kind, this.target.id) });
  protected consequences(): string[] {
    const p = this.preview.value();
    return p ? deletionConsequences(p) : [];
  }
}
