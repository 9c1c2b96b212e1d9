import type { Role } from '../../../shared/constants';

/** The demo accounts of the API contract, one per role. */
export const DEMO_ACCOUNTS: { email: string; name: string; roles: Role[] }[] = [
  { email: 'admin@tacklog.test', name: 'Ada Varga (admin)', roles: ['admin'] },
  { email: 'receiving@tacklog.test', name: 'Rune Okafor (receiving)', roles: ['receiving'] },
  { email: 'assembler@tacklog.test', name: 'Mira Lindqvist (assembler)', roles: ['assembler'] },
  { email: 'quality@tacklog.test', name: 'Tomas Ferreira (quality)', roles: ['quality'] },
  { email: 'purchasing@tacklog.test', name: 'Jun Halloran (purchasing)', roles: ['purchasing'] },
];
