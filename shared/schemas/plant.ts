import { z } from 'zod';

/** GET /api/config: what every client needs before it shows a time (public, no secrets). */
export const plantConfigSchema = z.object({
  /** IANA time zone of the plant: every time people read is shown in it. */
  plantZone: z.string().min(1),
  plantName: z.string().min(1),
});
export type PlantConfig = z.infer<typeof plantConfigSchema>;
