/** Page shown when the role guard turns someone away from an area. */
import { ChangeDetectionStrategy, Component, computed, inject, input } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { RouterLink } from '@angular/router';
import { SIGN_IN_PATH } from '@shared/auth-contract';
import { Session } from './session';

/** Explains which role an area needs and what the visitor can do about it. */
@Component({
  selector: 'app-not-allowed',
  templateUrl: './not-allowed.html',
  styleUrl: './notice-page.scss',
  imports: [MatButtonModule, RouterLink],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class NotAllowed {
  protected readonly session = inject(Session);
  protected readonly signInUrl = SIGN_IN_PATH;
  /** The area that refused entry (query parameter `area`). */
  readonly area = input<string>();
  /** The role that area needs (query parameter `needs`). */
  readonly needs = input<string>();
  protected readonly areaName = computed(() => this.area() || 'This page');
  protected readonly neededRole = computed(() => this.needs() || 'a higher');
}
