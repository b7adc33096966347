/** The containment caution beside every fault-seal result (juxtaposition, shale gouge ratio). */
export function SealCaution() {
  return (
    <aside
      className="rounded-lg border border-tip-400/60 bg-amber-50 px-3 py-2.5 text-xs leading-relaxed text-amber-900 dark:border-tip-600/60 dark:bg-amber-950/40 dark:text-amber-100"
      data-testid="seal-caution"
    >
      <strong className="font-semibold">Screening only.</strong> Juxtaposition and shale gouge ratio are estimates from interpreted cut-offs, a depth conversion
      and a generic published relationship; the ~20 % SGR threshold (Yielding et al. 1997) is a guide that differs between basins, not a verdict. Whether this
      fault holds CO2 or other fluids, and any decision on injection, storage containment or well placement, needs site-specific study (fault-rock and pressure
      data, monitoring), compliance with local regulation and permits, and review by qualified, where required licensed, professionals.
    </aside>
  );
}
