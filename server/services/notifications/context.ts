import { config } from '../../config';
import type { MailContext } from '../mail/templates/layout';
import { plantConfig } from '../plant';

/** The plant's name (the `plant` setting, as pages show it), zone and Tacklog's address, for rendering e-mails. */
export async function mailContext(now: Date = new Date()): Promise<MailContext> {
  const plant = await plantConfig();
  return { plantName: plant.plantName, zone: config.plantZone, baseUrl: config.baseUrl, now };
}
