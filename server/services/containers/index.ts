export { openContainer, moveContainer, emptyContainer, scrapContainer } from './lifecycle';
export { thawContainer, takeOutOfStorage, returnToStorage } from './storage';
export { materialFefo, getMaterialFefo } from './fefo';
export { loadContainer, loadContainerByCode, type ContainerContext } from './load';
export { getContainer } from './read';
