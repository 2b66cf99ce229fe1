import * as z from 'zod';

/** Route parameters, validated at the edge like bodies and queries. */
export const slugSchema = z.string().regex(/^[a-z0-9][a-z0-9-]{0,63}$/, 'not a workspace slug');
export const uuidSchema = z.uuid({ message: 'not an id' });

export const slugParams = z.object({ slug: slugSchema });
export const memberParams = z.object({ slug: slugSchema, userId: uuidSchema });
export const idParams = z.object({ slug: slugSchema, id: uuidSchema });
export const invitationTokenParams = z.object({ token: z.string().min(1).max(200) });
