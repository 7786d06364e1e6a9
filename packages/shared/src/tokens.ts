/** Personal API tokens for scripts: shown once at creation, stored only as a hash. */
import { z } from 'zod';

/** Every token starts with this, so leaked tokens are easy to recognise (e.g. by secret scanners). */
export const API_TOKEN_PREFIX = 'plt_';

export const apiTokenSchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  /** The first characters of the token, to tell tokens apart in lists. */
  prefix: z.string(),
  createdAt: z.string(),
  lastUsedAt: z.string().nullable(),
  revokedAt: z.string().nullable(),
});
export type ApiTokenDto = z.infer<typeof apiTokenSchema>;

export const createApiTokenSchema = z.object({ name: z.string().trim().min(1).max(100) });

export const createdApiTokenSchema = apiTokenSchema.extend({
  /** The secret itself: returned by the create call only. */
  token: z.string(),
});
export type CreatedApiTokenDto = z.infer<typeof createdApiTokenSchema>;
