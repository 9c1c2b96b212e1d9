import { z } from 'zod';

export const healthSchema = z.object({ ok: z.literal(true), db: z.literal('up') });
