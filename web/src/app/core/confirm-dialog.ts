/**
 * One question before an action that is hard to take back (cancelling a sweep, changing
 * someone's role): a title, what will happen, and two buttons that name the choices. Closes with
 * true only when the person picks the action; Escape, a click outside and the other button give
 * false, so callers do nothing unless the answer is exactly true.
 */
import { ChangeDetectionStrategy, Component, inject } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MAT_DIALOG_DATA, MatDialog, MatDialogModule } from '@angular/material/dialog';
import { map, type Observable } from 'rxjs';

/** What the dialog asks. */
export interface ConfirmQuestion {
  readonly title: string;
  /** What happens if the person goes on, one paragraph each. */
  readonly consequences: readonly string[];
  /** Label of the button that acts, e.g. "Cancel sweep". */
  readonly act: string;
  /** Label of the button that leaves things as they are, e.g. "Keep running". */
  readonly keep: string;
  /** Whether acting destroys something (the button is drawn in the error colour). */
  readonly isDestructive?: boolean;
}

/** The dialog; `afterClosed()` gives true to act. */
@Component({
  selector: 'app-confirm-dialog',
  template: `
    <h2 mat-dialog-title>{{ q.title }}</h2>
    <mat-dialog-content>
      @for (line of q.consequences; track $index) { <p>{{ line }}</p> }
    </mat-dialog-content>
    <mat-dialog-actions align="end">
      <button mat-button type="button" data-testid="confirm-keep" [mat-dialog-close]="false" cdkFocusInitial>{{ q.keep }}</button>
      <button mat-flat-button type="button" data-testid="confirm-act" [class.is-danger]="q.isDestructive" [mat-dialog-close]="true">{{ q.act }}</button>
    </mat-dialog-actions>
  `,
  styles: '.is-danger { --mat-button-filled-container-color: var(--mat-sys-error); --mat-button-filled-label-text-color: var(--mat-sys-on-error); }',
  imports: [MatDialogModule, MatButtonModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class ConfirmDialog {
  protected readonly q = inject<ConfirmQuestion>(MAT_DIALOG_DATA);
}

/** Opens the question; emits once, true only when the person chose to act. */
export function askToConfirm(dialog: MatDialog, question: ConfirmQuestion): Observable<boolean> {
  return dialog.open<ConfirmDialog, ConfirmQuestion, boolean>(ConfirmDialog, { data: question, width: '440px', maxWidth: '92vw', autoFocus: 'dialog' })
    .afterClosed().pipe(map((answer) => answer === true));
}
