"use client";
import { useSyncExternalStore } from "react";

const neverChanges = () => () => {};

/**
 * A value that exists only in the browser (WebGL support, local storage, the reader's clock), read without a state
 * update in an effect: null while the server renders and during hydration, then `read()`. `read` must return the same
 * value each time it is called (a primitive, or a cached object), as useSyncExternalStore requires.
 */
export function useBrowserValue<T>(read: () => T): T | null {
  return useSyncExternalStore(neverChanges, read, () => null);
}
