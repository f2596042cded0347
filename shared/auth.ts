/**
 * The account contract with its request schemas (zod). Zod-free values and types live in
 * auth-contract.ts; web code imports from there.
 */
import { z } from 'zod';

export * from './auth-contract';

/** PATCH /api/admin/users/:id (admin only); answers the updated Account. */
export const ChangeRoleRequest = z.object({ role: z.enum(['researcher', 'maintainer', 'admin']) }).strict();
export type ChangeRoleRequest = z.infer<typeof ChangeRoleRequest>;

/** PATCH /api/me/settings (signed in); answers the updated MeResponse. */
export const AccountSettingsRequest = z.object({ isEmailOn: z.boolean() }).strict();
export type AccountSettingsRequest = z.infer<typeof AccountSettingsRequest>;
