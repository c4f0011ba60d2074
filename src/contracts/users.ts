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

/** Roles given to a person: at least one. */
export const RoleList = z.array(RoleName).min(1, 'give at least one role').max(ROLES.length);
export type RoleList = z.infer<typeof RoleList>;

/** The body of `POST /api/admin/users`. */
export const InviteUserInput = z.object({
  email: z.string().trim().toLowerCase().email('must be an e-mail address'),
  name: z.string().trim().min(1, 'must not be empty').max(120),
  roles: RoleList,
});
export type InviteUserInput = z.infer<typeof InviteUserInput>;

/** The body of `PUT /api/admin/users/{id}/roles`. */
export const SetRolesRequest = z.object({ roles: RoleList });
export type SetRolesRequest = z.infer<typeof SetRolesRequest>;

/** What the roles service takes: the body with the person's id from the path. */
export const SetRolesInput = z.object({ userId: z.string().min(1), ...SetRolesRequest.shape });
export type SetRolesInput = z.infer<typeof SetRolesInput>;

/** The body of `PUT /api/admin/users/{id}/disabled`. */
export const SetDisabledRequest = z.object({
  disabled: z.boolean(),
  reason: z.string().trim().max(300).optional(),
});
export type SetDisabledRequest = z.infer<typeof SetDisabledRequest>;

/** What the disabling service takes: the body with the person's id from the path. */
export const SetDisabledInput = z.object({ userId: z.string().min(1), ...SetDisabledRequest.shape });
export type SetDisabledInput = z.infer<typeof SetDisabledInput>;
