const ROLE_STYLES: Record<string, string> = {
  owner: "bg-slip-100 text-slip-800 dark:bg-slip-900 dark:text-slip-200",
  interpreter: "bg-sky-100 text-sky-800 dark:bg-sky-950 dark:text-sky-200",
  reviewer: "bg-violet-100 text-violet-800 dark:bg-violet-950 dark:text-violet-200",
  viewer: "bg-slate-100 text-slate-700 dark:bg-slate-800 dark:text-slate-300",
};

export function RoleBadge({ role }: { role: string }) {
  return <span className={`rounded-full px-2 py-0.5 text-xs font-medium ${ROLE_STYLES[role] ?? ROLE_STYLES.viewer}`}>{role}</span>;
}
