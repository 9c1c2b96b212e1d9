import { config } from '../../config';
import type { MailContext } from '../mail/templates/layout';

/** The plant's name, zone and Tacklog's address, for rendering e-mails. */
export function mailContext(now: Date = new Date()): MailContext {
  return { plantName: config.plantName, zone: config.plantZone, baseUrl: config.baseUrl, now };
}
