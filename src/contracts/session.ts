import { z } from 'zod';
import { RoleName } from './users';

/** `GET /api/me` for a person: who is signed in and what their roles let them do (`resource:action`). */
export const SignedInPersonJson = z.object({
  id: z.string(),
  email: z.string(),
  name: z.string(),
  roles: z.array(RoleName),
  permissions: z.array(z.string()),
});
export type SignedInPersonJson = z.infer<typeof SignedInPersonJson>;

/** `GET /api/me` for a test station sending its token (null when neither signed in nor a station). */
export const StationMeJson = z.object({ station: z.object({ id: z.string(), name: z.string() }).nullable() });
export type StationMeJson = z.infer<typeof StationMeJson>;

/** `GET /api/me`. */
export const MeJson = z.union([SignedInPersonJson, StationMeJson]);
export type MeJson = z.infer<typeof MeJson>;

/** `GET /api/health`: 200 `{ ok: true }`; 503 with `ok: false` and the error when the database does not answer. */
export const HealthJson = z.object({ ok: z.boolean() });
export type HealthJson = z.infer<typeof HealthJson>;
