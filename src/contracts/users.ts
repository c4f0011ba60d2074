import { z } from 'zod';
import { ROLES } from '~/lib/access';
import { IsoDateTime } from './common';

export const RoleName = z.enum(ROLES);
export type RoleName = z.infer<typeof RoleName>;

/** A person with their roles. These keys are camelCase, as the people screen has always read them. */
export const UserJson = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  roles: z.array(RoleName),
  disabled: z.boolean(),
  /** Invited and not yet signed in to set a password. */
  invitationPending: z.boolean(),
  createdAt: IsoDateTime,
});
export type UserJson = z.infer<typeof UserJson>;

/** `GET /api/admin/users`: everyone, by e-mail. */
export const UserList = z.object({ users: z.array(UserJson) });
export type UserList = z.infer<typeof UserList>;

/** `POST /api/admin/users`: the person invited (the invitation is mailed). */
export const UserInvited = z.object({ id: z.string(), email: z.string(), roles: z.array(RoleName) });
export type UserInvited = z.infer<typeof UserInvited>;

/** `PUT /api/admin/users/{id}/roles`: the roles now. */
export const UserRolesSet = z.object({ id: z.string(), roles: z.array(RoleName) });
export type UserRolesSet = z.infer<typeof UserRolesSet>;

/** `PUT /api/admin/users/{id}/disabled`: whether the person is disabled now. */
export const UserDisabledSet = z.object({ id: z.string(), disabled: z.boolean() });
export type UserDisabledSet = z.infer<typeof UserDisabledSet>;
