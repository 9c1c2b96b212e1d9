import type { ScanResolver } from '../types';
import { containerResolver } from './container';
import { gs1Resolver } from './gs1';
import { stationResolver } from './station';
import { batchResolver } from './batch';
import { mixResolver } from './mix';
import { driverResolver } from './driver';

/**
 * Asked in this order; the first that recognises a code answers. To add a type (station,
 * batch, driver …), write a resolver in this folder and add it to the list.
 * Tacklog's own codes come before GS1, so a Digital Link that carries a container code is read
 * as that container.
 */
export const resolvers: ScanResolver[] = [
  containerResolver,
  // Looked up by exact code (null when no such record), before GS1 reads digits as element strings.
  mixResolver,
  batchResolver,
  driverResolver,
  stationResolver,
  gs1Resolver,
];
