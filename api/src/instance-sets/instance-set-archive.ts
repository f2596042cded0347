/**
 * GET /api/instance-sets/:id/archive (issue 16, item 6): the set's map and scenario files as one
 * zip, byte for byte as uploaded (a generated set: as the generator wrote them), in `maps/` and
 * `scenarios/` under a folder named after the set, with README.txt (what the set is and where its
 * files come from) and SHA256SUMS (the checksums stored at upload, in the format `sha256sum -c`
 * reads). Same visibility as the set's page: a set the viewer may not see answers 404.
 */
import { Router } from 'express';
import type { Models } from '../db/models';
import { AppError } from '../errors/app-error';
import { validate } from '../errors/validate';
import { sendZip } from '../http/zip-download';
import { APP_VERSION, appCommit } from '../version';
import { isSetVisible } from './instance-set-access';
import { IdParam } from './instance-sets.router';

/** One stored file as the archive lists it. */
interface ArchivedFile {
  readonly id: number;
  readonly name: string;
  readonly checksum: string;
  readonly byteSize: number;
  readonly createdAt: Date;
}

/**
 * A file or folder name safe inside a zip and extractable everywhere: path separators, control
 * characters and the characters Windows refuses in file names (`: * ? " < > |`) become `_`, and
 * names of dots only (`.`, `..`) get a leading `_`, so no entry can leave its folder.
 */
export function archiveName(name: string): string {
  const flat = name.replace(/[/\\:*?"<>|\u0000-\u001F\u007F]/g, '_').trim();
  return flat === '' ? '_' : /^\.+$/.test(flat) ? `_${flat}` : flat;
}

/**
 * `paths` made unique, in order: a path met before (two names that flattened alike, or differ only
 * in letter case, which case-insensitive file systems merge) gets `-2`, `-3`… before its extension.
 */
export function uniquePaths(paths: readonly string[]): string[] {
  const seen = new Set<string>();
  return paths.map((p) => {
    let candidate = p;
    const dot = p.lastIndexOf('.');
    const [stem, ext] = dot > p.lastIndexOf('/') + 1 ? [p.slice(0, dot), p.slice(dot)] : [p, ''];
    for (let n = 2; seen.has(candidate.toLowerCase()); n++) candidate = `${stem}-${n}${ext}`;
    seen.add(candidate.toLowerCase());
    return candidate;
  });
}

/** README.txt of the archive. */
function readme(set: { name: string; description: string; source: string; visibility: string }, maps: readonly ArchivedFile[], scenarios: readonly (ArchivedFile & { mapName: string })[], now: Date): string {
  const lines = [
    `Quarterturn instance set: ${set.name}`,
    '',
    ...(set.description ? [set.description, ''] : []),
    `Source and licence: ${set.source || '(not given)'}`,
    `Visibility: ${set.visibility}`,
    `Written ${now.toISOString()} by Quarterturn ${APP_VERSION} (commit ${appCommit()}).`,
    '',
    `maps/ holds ${maps.length} map file${maps.length === 1 ? '' : 's'} and scenarios/ ${scenarios.length} scenario file${scenarios.length === 1 ? '' : 's'},`,
    'each byte for byte as uploaded (or as the generator wrote it). SHA256SUMS lists the SHA-256 the hub stored',
    'for each file when it arrived; check them with `sha256sum -c SHA256SUMS` in this folder.',
    '',
    'Scenario -> map:',
    ...scenarios.map((s) => `  ${s.name} -> ${s.mapName}`),
  ];
  return lines.join('\n') + '\n';
}

/** The archive route, mounted under /instance-sets. */
export function instanceSetArchiveRouter(models: Models): Router {
  const r = Router();
  r.get('/:id/archive', async (req, res) => {
    const { id } = validate(IdParam, req.params);
    const set = await models.InstanceSet.findByPk(id);
    if (!set || !isSetVisible(set, req.user ?? null)) throw new AppError('INSTANCE_SET_NOT_FOUND', 404, `No instance set ${id}`);
    const attributes = ['id', 'name', 'checksum', 'byteSize', 'createdAt'];
    const maps: ArchivedFile[] = await models.MapFile.findAll({ where: { instanceSetId: id }, attributes, order: [['name', 'ASC']] });
    const mapNames = new Map(maps.map((m) => [m.id, m.name]));
    const scenarios = (await models.ScenarioFile.findAll({ where: { instanceSetId: id }, attributes: [...attributes, 'mapId'], order: [['name', 'ASC']] }))
      .map((s) => ({ id: s.id, name: s.name, checksum: s.checksum, byteSize: s.byteSize, createdAt: s.createdAt, mapName: mapNames.get(s.mapId) ?? '' }));
    const folder = archiveName(set.name);
    const now = new Date();
    const files = [
      ...maps.map((m) => ({ path: `maps/${archiveName(m.name)}`, file: m, load: async () => (await models.MapFile.findByPk(m.id, { attributes: ['original'] }))?.original })),
      ...scenarios.map((s) => ({ path: `scenarios/${archiveName(s.name)}`, file: s, load: async () => (await models.ScenarioFile.findByPk(s.id, { attributes: ['original'] }))?.original })),
    ];
    const paths = uniquePaths(files.map((f) => f.path));
    const entries = files.map((f, i) => ({ ...f, path: paths[i] }));
    await sendZip(res, `${set.name}.zip`, (zip) => {
      zip.addText(`${folder}/README.txt`, readme(set, maps, scenarios, now), now);
      // Two spaces between checksum and name: sha256sum's text-mode line (GNU coreutils manual, "md5sum invocation").
      zip.addText(`${folder}/SHA256SUMS`, entries.map((e) => `${e.file.checksum}  ${e.path}\n`).join(''), now);
      for (const e of entries) {
        zip.addLazy(`${folder}/${e.path}`, async () => {
          const bytes = await e.load();
          // Deleted while the archive was being written: end the download rather than leave a hole.
          if (!bytes) throw new Error(`${e.path} was deleted during the download`);
          return bytes;
        }, e.file.createdAt);
      }
    });
  });
  return r;
}
