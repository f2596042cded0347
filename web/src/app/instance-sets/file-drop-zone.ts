/** A drop target for map, scenario and zip files that also opens the file picker when clicked. */
import { ChangeDetectionStrategy, Component, input, output, signal } from '@angular/core';

/** Drop zone wrapping a multiple-file input; emits the chosen files once per drop or pick. */
@Component({
  selector: 'app-file-drop-zone',
  template: `
    <label
      class="zone"
      [class.is-over]="isOver()"
      [class.is-disabled]="disabled()"
      (dragenter)="markOver($event)"
      (dragover)="markOver($event)"
      (dragleave)="isOver.set(false)"
      (drop)="takeDrop($event)"
    >
      <input
        type="file"
        multiple
        accept=".map,.scen,.zip"
        [disabled]="disabled()"
        (change)="takePicked($event)"
        aria-label="Choose map, scenario or zip files"
      />
      <span class="lead">Drop .map, .scen or .zip files here</span>
      <span class="sub">or click to choose them · up to 8 MB a file, 64 MB unzipped in all</span>
    </label>
  `,
  styles: `
    .zone { display: flex; flex-direction: column; align-items: center; gap: 0.25rem; padding: 1.5rem 1rem; cursor: pointer;
      border: 2px dashed var(--mat-sys-outline); border-radius: var(--mat-sys-corner-medium); background: var(--mat-sys-surface-container-low); }
    .zone.is-over { border-color: var(--mat-sys-primary); background: var(--mat-sys-primary-container); }
    .zone.is-disabled { opacity: 0.6; cursor: progress; }
    .zone:focus-within { outline: 3px solid var(--qt-focus-ring, var(--mat-sys-primary)); outline-offset: 2px; }
    input { position: absolute; width: 1px; height: 1px; opacity: 0; }
    .lead { font: var(--mat-sys-title-small); }
    .sub { font: var(--mat-sys-body-small); color: var(--mat-sys-on-surface-variant); }
  `,
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export class FileDropZone {
  /** Whether files are refused for now (an upload is running). */
  readonly disabled = input(false);
  /** The files of one drop or one pick. */
  readonly filesChosen = output<File[]>();
  /** Whether something is being dragged over the zone. */
  protected readonly isOver = signal(false);

  protected markOver(event: DragEvent): void {
    event.preventDefault();
    if (!this.disabled()) this.isOver.set(true);
  }

  protected takeDrop(event: DragEvent): void {
    event.preventDefault();
    this.isOver.set(false);
    const files = Array.from(event.dataTransfer?.files ?? []);
    if (!this.disabled() && files.length > 0) this.filesChosen.emit(files);
  }

  protected takePicked(event: Event): void {
    const inputEl = event.target as HTMLInputElement;
    const files = Array.from(inputEl.files ?? []);
    // Cleared so picking the same files again (after fixing them) fires change again.
    inputEl.value = '';
    if (files.length > 0) this.filesChosen.emit(files);
  }
}
