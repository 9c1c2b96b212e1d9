import { containerResultSchema, type Container, type ContainerLocationInput, type ContainerScrapInput } from '@shared/schemas/containers';
import { apiFetch } from './http';

/** The actions a person takes on one container; each answers with the container as it is now. */
export type ContainerAction = 'open' | 'thaw' | 'empty' | 'out-of-storage' | 'return-to-storage';

function post(id: string, action: string, body?: unknown): Promise<Container> {
  return apiFetch(`/api/containers/${encodeURIComponent(id)}/${action}`, { method: 'POST', body, schema: containerResultSchema }).then(
    (r) => r.container,
  );
}

/** POST /api/containers/:id/{open|thaw|empty|out-of-storage|return-to-storage}. */
export function containerAction(id: string, action: ContainerAction): Promise<Container> {
  return post(id, action);
}

/** POST /api/containers/:id/location. */
export function moveContainer(id: string, input: ContainerLocationInput): Promise<Container> {
  return post(id, 'location', input);
}

/** POST /api/containers/:id/scrap (reason required). */
export function scrapContainer(id: string, input: ContainerScrapInput): Promise<Container> {
  return post(id, 'scrap', input);
}
