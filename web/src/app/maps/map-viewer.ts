/**
 * The page at /instance-sets/:id/maps/:mapId: one map on a zoomable canvas, the coordinates of
 * the cell under the pointer, and the starts and goals of the first k rows of a chosen scenario.
 */
import { ChangeDetectionStrategy, Component, computed, inject, input, signal } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { DecimalPipe } from '@angular/common';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { RouterLink } from '@angular/router';
import { catchError, of, switchMap } from 'rxjs';
import type { MapDetail, ScenarioDetail } from '@shared/instance-sets';
import { InstanceSetApi } from '../instance-sets/instance-set-api';
import { isPassableAt } from './map-bitmap';
import { MapCanvas, type AgentMarker } from './map-canvas';
import { MiddleEllipsisPipe } from '../core/middle-ellipsis.pipe';

/** The map viewer page. */
@Component({
  selector: 'app-map-viewer',
  templateUrl: './map-viewer.html',
  styleUrl: './map-viewer.scss',
  imports: [MiddleEllipsisPipe, DecimalPipe, RouterLink, MapCanvas, MatSelectModule, MatFormFieldModule, MatInputModule, MatButtonModule, MatProgressBarModule],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class MapViewer {
  private readonly api = inject(InstanceSetApi);
  /** Route parameter: the instance set id. */
  readonly id = input.required<string>();
  /** Route parameter: the map id. */
  readonly mapId = input.required<string>();

  /** undefined while loading, null when it failed. */
  protected readonly map = toSignal(toObservable(this.mapId).pipe(
    switchMap((id) => this.api.map(Number(id)).pipe(catchError(() => of(null)))),
  ));
  /** The chosen scenario's id, or null for none. */
  protected readonly scenarioId = signal<number | null>(null);
  /** How many of its rows to show. */
  protected readonly agentCount = signal(10);
  protected readonly scenario = toSignal(toObservable(this.scenarioId).pipe(
    switchMap((id) => (id === null ? of(null) : this.api.scenario(id).pipe(catchError(() => of(null))))),
  ));
  /** The largest k the chosen scenario offers. */
  protected readonly maxAgents = computed(() => this.scenario()?.maxAgents ?? 0);
  protected readonly markers = computed<readonly AgentMarker[]>(() => {
    const s: ScenarioDetail | null | undefined = this.scenario();
    if (!s) return [];
    return s.rows.slice(0, Math.min(this.agentCount(), s.maxAgents)).map((r) => ({ start: r.start, goal: r.goal }));
  });
  /** The cell under the pointer, else the keyboard cursor cell. */
  protected readonly hovered = signal<readonly [number, number] | null>(null);
  protected readonly hoverText = computed(() => {
    const cell = this.hovered();
    const m: MapDetail | null | undefined = this.map();
    if (!cell || !m) return 'Point at the map, or press Shift and an arrow key on it, to read a cell.';
    const [x, y] = cell;
    const kind = isPassableAt(m.rows, x, y) ? 'free' : 'blocked';
    const agents = this.markers().flatMap((a, i) => [
      ...(a.start[0] === x && a.start[1] === y ? [`start of agent ${i + 1}`] : []),
      ...(a.goal[0] === x && a.goal[1] === y ? [`goal of agent ${i + 1}`] : []),
    ]);
    return [`x ${x}, y ${y}`, kind, ...agents].join(' · ');
  });

  /** Picks a scenario to overlay (null clears it); k starts at min(10, its largest k). */
  protected chooseScenario(id: number | null): void {
    this.scenarioId.set(id);
    this.agentCount.set(10);
  }

  /** Takes k from the number field, kept within 1..maxAgents. */
  protected chooseAgentCount(text: string): void {
    const k = Math.round(Number(text));
    if (Number.isFinite(k)) this.agentCount.set(Math.max(1, Math.min(k, this.maxAgents() || 1)));
  }
}
