import { describe, expect, it } from "vitest";
import { lruCache } from "@/lib/lru";

// basis: common practice, no source (least-recently-used eviction)
describe("lruCache", () => {
  it("keeps the most recently used entries up to its limit", () => {
    const cache = lruCache<number>(2);
    cache.set("a", 1);
    cache.set("b", 2);
    expect(cache.get("a")).toBe(1); // a is now the most recent
    cache.set("c", 3); // evicts b
    expect(cache.get("b")).toBeUndefined();
    expect(cache.get("a")).toBe(1);
    expect(cache.get("c")).toBe(3);
    cache.delete("a");
    expect(cache.get("a")).toBeUndefined();
  });
});
