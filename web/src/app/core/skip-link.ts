/**
 * A link that moves keyboard focus past a block (the page's top bar, a long table) to the element
 * with the given id. Hidden until it holds focus (the `.qt-skip-link` rule in styles.scss). It
 * focuses the target itself rather than changing the URL's fragment, which the router would read
 * as a navigation; a target that is not focusable gets tabindex -1 so the next Tab goes on from it.
 */
import { Directive, input } from '@angular/core';

/** `<a appSkipTo="target-id">Skip …</a>` */
@Directive({
  selector: 'a[appSkipTo]',
  host: { class: 'qt-skip-link', '[attr.href]': "'#' + target()", '(click)': 'skip($event)' },
})
export class SkipLink {
  /** Id of the element that receives focus. */
  readonly target = input.required<string>({ alias: 'appSkipTo' });

  protected skip(event: Event): void {
    event.preventDefault();
    focusById(this.target());
  }
}

/**
 * Focuses the element with `id` (made focusable by script when it is not) and, unless `isScrolled`
 * is false, scrolls it to the top; false when there is none.
 */
export function focusById(id: string, isScrolled = true): boolean {
  const el = document.getElementById(id);
  if (!el) return false;
  if (!el.hasAttribute('tabindex') && el.tabIndex < 0) el.setAttribute('tabindex', '-1');
  el.focus({ preventScroll: !isScrolled });
  if (isScrolled) el.scrollIntoView?.({ block: 'start' });
  return true;
}
