import { z } from 'zod';

// Session ids are better-auth's random tokens; anything else (a NUL byte the database cannot even compare) names none.
export const endSessionSchema = z.object({ sessionId: z.string().min(1).max(200).regex(/^[A-Za-z0-9_-]+$/, 'That session was not found.') });
export const endOtherSessionsSchema = z.object({});
