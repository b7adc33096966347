/** The Slipfield mark: two offset blocks across an inclined slip surface. */
export function Logo({ className = "h-7 w-7" }: { className?: string }) {
  return (
    <svg viewBox="0 0 32 32" className={className} aria-hidden="true">
      <rect width="32" height="32" rx="8" className="fill-slip-700 dark:fill-slip-500" />
      <path d="M5 11h11l-3 10H5z" fill="#fff" opacity="0.95" />
      <path d="M19 15h8v10h-11z" fill="#fff" opacity="0.65" />
      <path d="M17.5 6 12 27" stroke="#f5a524" strokeWidth="2.2" strokeLinecap="round" />
    </svg>
  );
}
