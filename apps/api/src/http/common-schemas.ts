import { z } from 'zod';

export const uuid = z.string().uuid({ error: 'must be an id (uuid)' });
export const idParams = z.object({ id: uuid });
export const projectParams = z.object({ projectId: uuid });
export const okResponse = z.object({ ok: z.literal(true) });
export const name = z.string().trim().min(1, { error: 'Name is required' }).max(200);
export const description = z.string().max(5000).default('');
export const pageQuery = z.object({ limit: z.coerce.number().int().min(1).max(500).default(100) });
