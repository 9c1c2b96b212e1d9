import { eq } from 'drizzle-orm';
import { db } from '../db/client';
import { settings } from '../db/schema';
import { config } from '../config';
import type { PlantConfig } from '../../shared/schemas/plant';
import { readSetting } from './settings';

/**
 * The plant as clients need to know it: its time zone (TACKLOG_PLANT_ZONE, checked at start)
 * and its name (the `plant` setting, else TACKLOG_PLANT_NAME).
 */
export async function plantConfig(): Promise<PlantConfig> {
  const [row] = await db.select({ value: settings.value }).from(settings).where(eq(settings.key, 'plant'));
  const value = row?.value as { name?: unknown } | undefined;
  const name = typeof value?.name === 'string' && value.name.trim() !== '' ? value.name.trim() : config.plantName;
  return { plantZone: config.plantZone, plantName: name, minPasswordLength: await readSetting('minPasswordLength') };
}
