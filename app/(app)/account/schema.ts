import { z } from 'zod';

export const endSessionSchema = z.object({ sessionId: z.string().min(1).max(200) });
export const endOtherSessionsSchema = z.object({});
