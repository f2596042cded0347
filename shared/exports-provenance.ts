/**
 * Where the figures of an export come from (issue 14, item 9): the hub build that wrote the file,
 * when, and the sweeps, seeds, robot profiles and instance files of exactly the exported results.
 * CSV, Markdown and LaTeX write it as a header comment (one `key: value` line each), JSON as a
 * `meta` object. Zod-free and pure, shared by the API and tests; every format escapes the values
 * itself (a set or file name is user text).
 */
import { foldControlCharacters } from './control-characters';

/** A map or scenario file of the exported results, with the SHA-256 of its bytes as uploaded. */
export interface ProvenanceFile {
  /** Instance set the file belongs to. */
  readonly set: string;
  readonly name: string;
  /** Lower-case hex SHA-256 of the uploaded bytes (stored at upload). */
  readonly sha256: string;
}

/** A robot profile of the exported results: its hash, its label and every parameter. */
export interface ProvenanceProfile {
  readonly hash: string;
  readonly label: string;
  readonly parameters: Readonly<Record<string, number | string | boolean | null>>;
}

/** Provenance of an export. */
export interface ExportProvenance {
  /** The hub that wrote the file: package version and git commit ("unknown" outside a checkout). */
  readonly hub: { readonly version: string; readonly commit: string };
  /** Export time, ISO 8601 in UTC. */
  readonly exportedAt: string;
  /** How many stored results the exported figures come from. */
  readonly results: number;
  /** Sweeps that computed them, ascending. */
  readonly sweeps: readonly number[];
  /** Plan submissions among them (plans computed elsewhere; they have no sweep and no seed), ascending. */
  readonly submissions: readonly number[];
  /** Distinct solver seeds of the sweep results, ascending. */
  readonly seeds: readonly number[];
  readonly profiles: readonly ProvenanceProfile[];
  readonly maps: readonly ProvenanceFile[];
  readonly scenarios: readonly ProvenanceFile[];
  /** What a reader must know about figures that come from other results than the listed ones. */
  readonly notes?: readonly string[];
}

/** A list as text: comma-separated, or "none". */
const list = (values: readonly (number | string)[]): string => (values.length === 0 ? 'none' : values.join(', '));

/**
 * The provenance as `key: value` pairs in a fixed order, each value on one line (control
 * characters and line breaks folded to spaces, so a name can never end a comment line early).
 */
export function provenanceEntries(p: ExportProvenance): readonly (readonly [key: string, value: string])[] {
  const entries: [string, string][] = [
    ['hub version', p.hub.version],
    ['hub commit', p.hub.commit],
    ['exported at', p.exportedAt],
    ['results', String(p.results)],
    ['sweeps', list(p.sweeps)],
    ['submissions', list(p.submissions)],
    ['seeds', list(p.seeds)],
    ...p.profiles.map((r): [string, string] => [
      `robot profile ${r.hash}`,
      `${r.label} (${Object.entries(r.parameters).map(([k, v]) => `${k}=${String(v)}`).join(' ')})`,
    ]),
    ...p.maps.map((f): [string, string] => [`map ${f.set} / ${f.name}`, `sha256 ${f.sha256}`]),
    ...p.scenarios.map((f): [string, string] => [`scenario ${f.set} / ${f.name}`, `sha256 ${f.sha256}`]),
    ...(p.notes ?? []).map((n): [string, string] => ['note', n]),
  ];
  return entries.map(([k, v]) => [foldControlCharacters(k), foldControlCharacters(v)] as const);
}

/** The provenance as comment lines without the comment marker: a title, then "key: value". */
export function provenanceLines(p: ExportProvenance): readonly string[] {
  return ['Provenance (Quarterturn export)', ...provenanceEntries(p).map(([k, v]) => `${k}: ${v}`)];
}
