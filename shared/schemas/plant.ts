import { z } from 'zod';

/** GET /api/config: what every client needs before it shows a time (public, no secrets). */
export const plantConfigSchema = z.object({
  /** IANA time zone of the plant: every time people read is shown in it. */
  plantZone: z.string().min(1),
  plantName: z.string().min(1),
  /** Shortest password the plant accepts (setting `minPasswordLength`), for the forms' hints; the server checks. */
  minPasswordLength: z.number().int().positive().optional(),
});
export type PlantConfig = z.infer<typeof plantConfigSchema>;
