"use client";
import { useSyncExternalStore } from "react";

// The page's theme: the "dark" class on <html> (set before first paint by the layout and by the theme toggle).
function subscribe(onChange: () => void) {
  const observer = new MutationObserver(onChange);
  observer.observe(document.documentElement, { attributes: true, attributeFilter: ["class"] });
  return () => observer.disconnect();
}

const isDark = () => document.documentElement.classList.contains("dark");

/** True while the page shows the dark theme; follows the theme toggle. */
export function useDarkMode(): boolean {
  return useSyncExternalStore(subscribe, isDark, () => false);
}
