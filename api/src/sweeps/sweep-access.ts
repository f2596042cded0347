/** Who sees and who cancels a sweep: its owner, and maintainers and admins (who run the shared workers). */
import { hasRole } from '@shared/auth';

/** Whether `viewer` may see and cancel a sweep owned by `ownerId`. */
export function canSeeSweep(ownerId: number, viewer: Express.User): boolean {
  return viewer.id === ownerId || hasRole(viewer.role, 'maintainer');
}
