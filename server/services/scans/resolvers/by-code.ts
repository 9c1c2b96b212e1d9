/** Tacklog's own codes are stored upper case; a scanner with caps lock on sends them lower case. */
export async function findByCode<T>(code: string, find: (c: string) => Promise<T | undefined>): Promise<T | undefined> {
  const exact = await find(code);
  if (exact !== undefined || code === code.toUpperCase()) return exact;
  return find(code.toUpperCase());
}
