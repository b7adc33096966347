// The browser tests and the 3D benchmark read the scene's camera and frame timing through window properties. They are
// installed only behind this one flag — `localStorage["slipfield-test-hooks"] = "on"`, which playwright.config.ts sets
// for every browser context and bench/scene-frames.ts for its page — never for a user. (The readiness flag
// window.__slipfieldSceneReady is not a test hook: the app's own scene picture waits on it.)
export const TEST_HOOKS_KEY = "slipfield-test-hooks";

export function testHooksEnabled(): boolean {
  try {
    return typeof window !== "undefined" && window.localStorage.getItem(TEST_HOOKS_KEY) === "on";
  } catch {
    return false;
  }
}
