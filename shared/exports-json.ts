/**
 * JSON export: the caption, the caution (with execution figures), the columns (id, label, unit),
 * one object per row keyed by column id, numbers at full precision, and `meta`, the provenance
 * (issue 14, item 9; added beside the older fields, which keep their meaning).
 */
import type { ExportProvenance } from './exports-provenance';
import { withIntervalColumns, type ExportTable } from './exports-table';

/** The JSON document of an export. */
export interface ExportJson {
  readonly caption: string;
  /** The caution that goes with execution figures; absent without them. */
  readonly caution?: string;
  readonly columns: readonly { readonly id: string; readonly label: string; readonly unit: string | null }[];
  readonly rows: readonly Readonly<Record<string, string | number | null>>[];
  /** Where the figures come from; absent when the table was written without it. */
  readonly meta?: ExportProvenance;
}

/** The table as a JSON text (two-space indent). */
export function toJsonExport(exported: ExportTable): string {
  // Intervals as their own low / high columns, so every value stays one plain number.
  const table = withIntervalColumns(exported);
  const doc: ExportJson = {
    caption: table.caption,
    ...(table.caution ? { caution: table.caution } : {}),
    columns: table.columns.map((c) => ({ id: c.id, label: c.label, unit: c.unit ?? null })),
    rows: table.rows.map((r) => Object.fromEntries(table.columns.map((c, i) => [c.id, r[i]]))),
    ...(table.provenance ? { meta: table.provenance } : {}),
  };
  return `${JSON.stringify(doc, null, 2)}\n`;
}
