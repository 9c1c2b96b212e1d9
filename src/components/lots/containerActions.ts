import type { LotStatus, StorageClass } from '@shared/constants';
import type { Action } from '@shared/permissions';
import type { Container } from '@shared/schemas/containers';
import type { ContainerAction } from '@/api/containers';

export type ContainerMenuAction = ContainerAction | 'location' | 'scrap' | 'reprint';

export interface ContainerMenuItem {
  action: ContainerMenuAction;
  label: string;
  icon: string;
}

/**
 * The actions a person may take on a container now, by its state, the material's storage
 * class and what the person may do (`can`, e.g. the session's). The client only hides; the server checks again and says why
 * it refuses.
 */
export function containerMenu(
  c: Pick<Container, 'status' | 'thawedAt' | 'outOfStorageSince'>,
  storageClass: StorageClass,
  can: (action: Action) => boolean,
  lotStatus: LotStatus = 'released',
): ContainerMenuItem[] {
  const live = c.status === 'sealed' || c.status === 'open';
  const items: ContainerMenuItem[] = [];
  if (can('containers.handle') && live) {
    if (storageClass === 'frozen' && !c.thawedAt && c.status === 'sealed')
      items.push({ action: 'thaw', label: 'Record the end of the thaw', icon: 'ac_unit' });
    // Only a released lot may be opened (on hold, quarantined and rejected lots are blocked).
    if (lotStatus === 'released' && c.status === 'sealed' && (storageClass !== 'frozen' || c.thawedAt))
      items.push({ action: 'open', label: 'Open', icon: 'lock_open' });
    if (storageClass === 'refrigerated' && !c.outOfStorageSince)
      items.push({ action: 'out-of-storage', label: 'Take out of cold storage', icon: 'logout' });
    if (storageClass === 'refrigerated' && c.outOfStorageSince)
      items.push({ action: 'return-to-storage', label: 'Back into cold storage', icon: 'login' });
    items.push({ action: 'location', label: 'Move to another location', icon: 'place' });
  }
  if (can('containers.empty') && live) items.push({ action: 'empty', label: 'Mark empty', icon: 'check_box_outline_blank' });
  if (can('containers.scrap') && live) items.push({ action: 'scrap', label: 'Scrap…', icon: 'delete' });
  if (can('labels.print')) items.push({ action: 'reprint', label: 'Reprint its label', icon: 'print' });
  return items;
}
