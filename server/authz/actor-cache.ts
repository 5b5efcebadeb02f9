import "server-only";

// Who-is-this lookups (a token's or a user's memberships) are cached for a few seconds so that
// busy routes (predictions, scripted calls) make no database round trip per request. Every change
// to memberships, roles or tokens clears the cache of this process at once; other processes see the
// change within TTL_MS.
const TTL_MS = 5_000;
const MAX_ENTRIES = 5_000;

type Entry = { value: unknown; expires: number };
const store = ((globalThis as { tributaryActorCache?: Map<string, Entry> }).tributaryActorCache ??= new Map());

export async function cached<T>(key: string, load: () => Promise<T>): Promise<T> {
  const now = Date.now();
  const hit = store.get(key);
  if (hit && hit.expires > now) return hit.value as T;
  const value = await load();
  if (store.size >= MAX_ENTRIES) store.clear();
  store.set(key, { value, expires: now + TTL_MS });
  return value;
}

/** Call after any change to memberships, roles, users or API tokens. */
export function invalidateActorCache(): void {
  store.clear();
}
