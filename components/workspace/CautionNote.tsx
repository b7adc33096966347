/** The screening caution shown wherever a result could feed containment, injection or well decisions. */
export function CautionNote({ compact = false }: { compact?: boolean }) {
  return (
    <aside
      className="rounded-lg border border-tip-400/60 bg-amber-50 px-3 py-2.5 text-xs leading-relaxed text-amber-900 dark:border-tip-600/60 dark:bg-amber-950/40 dark:text-amber-100"
      data-testid="caution"
    >
      <strong className="font-semibold">Screening only.</strong>{" "}
      {compact
        ? "Tip lines, relays and throws here are interpretations of seismic data; decisions on injection, storage containment, drilling or well placement need site-specific study, local regulation and licensed professionals."
        : "These results are estimates derived from interpreted seismic data and generic published relationships. Mapped and inferred tip lines, relay linkage and throws are not a site-specific engineering, safety or regulatory assessment and must not be used on their own for decisions on injection, CO2 storage containment, drilling or well placement. Such decisions need site-specific data and study, monitoring, compliance with local regulation and permits, and review by qualified, where required licensed, professionals."}
    </aside>
  );
}
