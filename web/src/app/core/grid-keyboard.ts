/**
 * Keyboard behaviour shared by the app's AG Grid tables. Tab leaves a grid in one step (in both
 * directions, from a header cell or a body cell); inside it the arrow keys, Page Up/Down, Home and
 * End move between cells, as AG Grid does by default. Links drawn in cells are no tab stops of
 * their own: Enter on the focused cell follows the cell's link.
 * AG Grid 36 API (gridOptions.d.ts): `tabToNextCell` and `tabToNextHeader` return `false` "to let
 * the browser handle the tab behaviour", and the grid then moves focus out of its container.
 */
import type { CellKeyDownEvent, FullWidthCellKeyDownEvent } from 'ag-grid-community';

/** For `[tabToNextCell]` and `[tabToNextHeader]`: never walk cell by cell. */
export const leaveGridOnTab = (): false => false;

/** For `(cellKeyDown)`: Enter on a cell that holds a link follows it, as a click on the link would. */
export function followCellLinkOnEnter(event: CellKeyDownEvent | FullWidthCellKeyDownEvent): void {
  const key = event.event as KeyboardEvent | null | undefined;
  if (!key || key.key !== 'Enter' || key.altKey || key.ctrlKey || key.metaKey || key.shiftKey) return;
  const cell = (key.target as HTMLElement | null)?.closest('.ag-cell');
  const link = cell?.querySelector<HTMLAnchorElement>('a[href]');
  if (!link) return;
  key.preventDefault();
  link.click();
}

/** A link for a grid cell: reached through its cell (Enter), not as a tab stop of its own. */
export function cellLink(href: string, text: string, label: string): HTMLAnchorElement {
  const a = document.createElement('a');
  a.href = href;
  a.textContent = text;
  a.setAttribute('aria-label', label);
  a.tabIndex = -1;
  return a;
}
