/**
 * A small least-recently-used map kept on globalThis under `name`, so that every bundle of the
 * server process (route handlers, pages, instrumentation) shares one instance across hot reloads.
 */
export function processLru<V>(name: string, capacity: number) {
  const holder = globalThis as unknown as Record<string, Map<string, V> | undefined>;
  const key = `__papinLru_${name}`;
  const entries = (holder[key] ??= new Map<string, V>());
  return {
    get(id: string): V | undefined {
      const value = entries.get(id);
      if (value === undefined) return undefined;
      entries.delete(id);
      entries.set(id, value);
      return value;
    },
    set(id: string, value: V) {
      entries.delete(id);
      entries.set(id, value);
      while (entries.size > capacity) entries.delete(entries.keys().next().value!);
    },
    delete: (id: string) => entries.delete(id),
    clear: () => entries.clear(),
  };
}
