import type { ScanResolver } from '../types';
import { containerResolver } from './container';
import { gs1Resolver } from './gs1';

/**
 * Asked in this order; the first that recognises a code answers. To add a type (station,
 * batch, driver …), write a resolver in this folder and add it to the list.
 * Tacklog's own codes come before GS1, so a Digital Link that carries a container code is read
 * as that container.
 */
export const resolvers: ScanResolver[] = [
  containerResolver,
  gs1Resolver,
];
