/** In-process sliding-window limiter: enough for one server; a shared store is the scale-out path. */
export function createRateLimiter({ limit, windowMs }: { limit: number; windowMs: number }) {
  const hits = new Map<string, number[]>();
  return {
    /** Records one attempt; returns false when the key is over its limit. */
    attempt(key: string, now = Date.now()): boolean {
      const recent = (hits.get(key) ?? []).filter((time) => now - time < windowMs);
      if (recent.length >= limit) {
        hits.set(key, recent);
        return false;
      }
      recent.push(now);
      hits.set(key, recent);
      if (hits.size > 10_000) {
        for (const [storedKey, times] of hits) if (times.every((time) => now - time >= windowMs)) hits.delete(storedKey);
      }
      return true;
    },
    reset(key: string) {
      hits.delete(key);
    },
  };
}

export const signInLimiter = createRateLimiter({ limit: 8, windowMs: 5 * 60_000 });
