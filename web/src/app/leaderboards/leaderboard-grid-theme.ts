/** The grid's theme: AG Grid's Quartz theme with Quarterturn's colours and type through the Material system tokens. */
import { themeQuartz } from 'ag-grid-community';

/** Theme bound to the board's `[theme]`. */
export const LEADERBOARD_GRID_THEME = themeQuartz.withParams({
  accentColor: 'var(--mat-sys-primary)',
  backgroundColor: 'var(--mat-sys-surface)',
  foregroundColor: 'var(--mat-sys-on-surface)',
  headerBackgroundColor: 'var(--mat-sys-surface-container)',
  headerTextColor: 'var(--mat-sys-on-surface-variant)',
  oddRowBackgroundColor: 'var(--mat-sys-surface-container-lowest)',
  borderColor: 'var(--mat-sys-outline-variant)',
  fontFamily: 'inherit',
  fontSize: 13,
  headerFontWeight: 600,
  rowHeight: 32,
  headerHeight: 40,
  wrapperBorderRadius: 6,
});
