/**
 * Browser-test helpers that read the demo plant through the API (a signed-in playwright request
 * context): JSON calls, and usable containers of a material — from the demo stock, or received
 * and released on the spot when the demo history has used it all up, as the plant would.
 */
import { request as playwrightRequest, type APIRequestContext } from 'playwright-core';
import { DEMO_PASSWORD } from './browser';

export async function json<T>(request: APIRequestContext, path: string, init?: { data: unknown }): Promise<T> {
  const response = init ? await request.post(path, { data: init.data }) : await request.get(path);
  if (!response.ok()) throw new Error(`${path}: HTTP ${response.status()} ${await response.text()}`);
  return (await response.json()) as T;
}

interface ContainerRow {
  code: string;
  status: string;
  remaining: number;
  effectiveExpiry: string | null;
}

/** Usable containers (released lot, not empty, not expired within the hour) of a material. */
export async function usableContainers(request: APIRequestContext, materialCode: string, atLeast = 10): Promise<string[]> {
  const materials = await json<{ items: { id: string; code: string }[] }>(request, '/api/materials');
  const material = materials.items.find((m) => m.code === materialCode);
  if (!material) throw new Error(`material ${materialCode} is not in the demo catalogue`);
  const lots = await json<{ items: { id: string }[] }>(request, `/api/lots?materialId=${material.id}&status=released&limit=50`);
  const codes: string[] = [];
  for (const lot of lots.items) {
    const detail = await json<{ containers: ContainerRow[] }>(request, `/api/lots/${lot.id}`);
    for (const c of detail.containers) {
      const fresh = !c.effectiveExpiry || Date.parse(c.effectiveExpiry) > Date.now() + 3_600_000;
      if ((c.status === 'sealed' || c.status === 'open') && c.remaining >= atLeast && fresh) codes.push(c.code);
    }
  }
  return codes;
}

/** A request context signed in as one of the demo accounts. */
export async function signedIn(baseUrl: string, email: string): Promise<APIRequestContext> {
  const ctx = await playwrightRequest.newContext({ baseURL: baseUrl });
  await json(ctx, '/api/auth/login', { data: { email, password: DEMO_PASSWORD } });
  return ctx;
}

/** A usable container of the material: from the demo stock, or received and released now. */
export async function containerOf(baseUrl: string, request: APIRequestContext, materialCode: string, atLeast = 10): Promise<string> {
  const [existing] = await usableContainers(request, materialCode, atLeast);
  if (existing) return existing;
  const receiving = await signedIn(baseUrl, 'receiving@tacklog.test');
  const quality = await signedIn(baseUrl, 'quality@tacklog.test');
  try {
    const materials = await json<{ items: { id: string; code: string }[] }>(receiving, '/api/materials');
    const suppliers = await json<{ items: { id: string }[] }>(receiving, '/api/suppliers');
    const received = await json<{ lot: { id: string; status: string }; containers: { code: string }[] }>(receiving, '/api/lots', {
      data: {
        materialId: materials.items.find((m) => m.code === materialCode)!.id,
        supplierId: suppliers.items[0].id,
        supplierLot: `E2E-${materialCode}-${Date.now()}`,
        containers: 1,
        quantityPerContainer: 100,
      },
    });
    if (received.lot.status !== 'released') {
      await json(quality, `/api/lots/${received.lot.id}/status`, {
        data: { status: 'released', reason: 'Incoming inspection passed (browser test).' },
      });
    }
    return received.containers[0].code;
  } finally {
    await receiving.dispose();
    await quality.dispose();
  }
}
