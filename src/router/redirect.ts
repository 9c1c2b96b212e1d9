import type { LocationQueryValue } from 'vue-router';

/**
 * The path to return to after signing in, taken from the `redirect` query. Only paths inside
 * this app are followed ("/lots/…"), never another site ("//host", "https://…").
 */
export function safeRedirect(value: LocationQueryValue | LocationQueryValue[] | undefined): string | null {
  const raw = Array.isArray(value) ? value[0] : value;
  if (typeof raw !== 'string' || raw === '') return null;
  if (!raw.startsWith('/') || raw.startsWith('//') || raw.startsWith('/\\')) return null;
  if (raw === '/sign-in' || raw.startsWith('/sign-in?')) return null;
  return raw;
}
