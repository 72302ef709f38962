/**
 * The caches' bound: a Map kept to at most `limit` entries by dropping the
 * oldest one (insertion order) before a new key goes in. Dropping an entry
 * only loses work: every cache here recomputes what it no longer holds.
 */
export function setBounded<K, V>(map: Map<K, V>, key: K, value: V, limit: number): void {
  if (map.size >= limit && !map.has(key)) map.delete(map.keys().next().value as K);
  map.set(key, value);
}
