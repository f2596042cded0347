/** JSON export: the caption, the columns (id, label, unit) and one object per row keyed by column id, numbers at full precision. */
import { withIntervalColumns, type ExportTable } from './exports-table';

/** The JSON document of an export. */
export interface ExportJson {
  readonly caption: string;
  readonly columns: readonly { readonly id: string; readonly label: string; readonly unit: string | null }[];
  readonly rows: readonly Readonly<Record<string, string | number | null>>[];
}

/** The table as a JSON text (two-space indent). */
export function toJsonExport(exported: ExportTable): string {
  // Intervals as their own low / high columns, so every value stays one plain number.
  const table = withIntervalColumns(exported);
  const doc: ExportJson = {
    caption: table.caption,
    columns: table.columns.map((c) => ({ id: c.id, label: c.label, unit: c.unit ?? null })),
    rows: table.rows.map((r) => Object.fromEntries(table.columns.map((c, i) => [c.id, r[i]]))),
  };
  return `${JSON.stringify(doc, null, 2)}\n`;
}
