/**
 * Who sees and who manages an instance set. Public sets are seen by everyone; a private set
 * only by its owner, maintainers and admins, and to anyone else it does not exist (404, so
 * its name and id leak nothing). Managing (upload, generate, delete) is for the owner,
 * maintainers and admins.
 */
import { hasRole } from '@shared/auth';
import type { Visibility } from '@shared/instance-sets';

/** The signed-in account asking, or null for a visitor. */
export type Viewer = Express.User | null;

/** The fields of a set the rules look at. */
export interface SetAccessFields {
  readonly ownerId: number;
  readonly visibility: Visibility;
}

/** Whether the viewer may see every set, private ones included. */
function isCurator(viewer: Viewer): boolean {
  return viewer !== null && hasRole(viewer.role, 'maintainer');
}

/** Whether `viewer` may see `set`. */
export function isSetVisible(set: SetAccessFields, viewer: Viewer): boolean {
  return set.visibility === 'public' || isCurator(viewer) || (viewer !== null && viewer.id === set.ownerId);
}

/** Whether `viewer` may change `set` (upload, generate, delete). */
export function canManageSet(set: SetAccessFields, viewer: Viewer): boolean {
  return viewer !== null && (viewer.id === set.ownerId || isCurator(viewer));
}

/** A SQL condition on the instance_sets alias `s` selecting the sets `viewer` may see. */
export function visibleSetsCondition(viewer: Viewer): { readonly sql: string; readonly replacements: Record<string, unknown> } {
  if (isCurator(viewer)) return { sql: 'TRUE', replacements: {} };
  if (viewer) return { sql: "(s.visibility = 'public' OR s.owner_id = :viewerId)", replacements: { viewerId: viewer.id } };
  return { sql: "s.visibility = 'public'", replacements: {} };
}
