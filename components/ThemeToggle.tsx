"use client";

export function ThemeToggle() {
  function toggle() {
    const dark = !document.documentElement.classList.contains("dark");
    document.documentElement.classList.toggle("dark", dark);
    try {
      localStorage.setItem("slipfield-theme", dark ? "dark" : "light");
    } catch {}
  }
  return (
    <button type="button" onClick={toggle} className="btn-quiet px-2.5" aria-label="Switch light or dark theme" title="Light / dark">
      <svg viewBox="0 0 20 20" className="h-4 w-4" aria-hidden="true">
        <path d="M10 2a8 8 0 1 0 0 16V2z" fill="currentColor" />
        <circle cx="10" cy="10" r="7.25" fill="none" stroke="currentColor" strokeWidth="1.5" />
      </svg>
    </button>
  );
}
