import { z } from 'zod';
import { ROLES } from '~/lib/access';

export const RoleList = z.array(z.enum(ROLES)).min(1, 'give at least one role').max(ROLES.length);

export const InviteUserInput = z.object({
  email: z.string().trim().toLowerCase().email('must be an e-mail address'),
  name: z.string().trim().min(1, 'must not be empty').max(120),
  roles: RoleList,
});
export type InviteUserInput = z.infer<typeof InviteUserInput>;

export const SetRolesInput = z.object({ userId: z.string().min(1), roles: RoleList });
export type SetRolesInput = z.infer<typeof SetRolesInput>;

export const SetDisabledInput = z.object({
  userId: z.string().min(1),
  disabled: z.boolean(),
  reason: z.string().trim().max(300).optional(),
});
export type SetDisabledInput = z.infer<typeof SetDisabledInput>;
