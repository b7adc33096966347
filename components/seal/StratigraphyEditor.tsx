"use client";
// The study's stratigraphy table: its units top to bottom, each with the horizon at its top, its kind (reservoir, seal
// or other) and its clay (shale) fraction. Owners and interpreters edit it; everyone else reads it.
import { useState } from "react";
import { useMutation, useQueryClient } from "@tanstack/react-query";
import { apiFetch, ApiRequestError } from "@/lib/api/client";
import type { StratigraphyUnit, UnitKind } from "@/lib/engine/juxtaposition";
import { stratigraphySchema, UNIT_KINDS } from "@/lib/contracts/seal";
import { stratigraphyKey, type StratigraphyView } from "./useSealData";

interface Row {
  name: string;
  topHorizon: string;
  kind: UnitKind;
  /** the clay fraction as typed; blank is unknown */
  clay: string;
}

const toRows = (units: StratigraphyUnit[]): Row[] =>
  units.map((unit) => ({ name: unit.name, topHorizon: unit.topHorizon, kind: unit.kind, clay: unit.clayFraction === null ? "" : String(unit.clayFraction) }));

export function StratigraphyEditor({ studyId, table, horizons, canEdit }: { studyId: string; table: StratigraphyView; horizons: string[]; canEdit: boolean }) {
  const queryClient = useQueryClient();
  const [editing, setEditing] = useState(false);
  const [rows, setRows] = useState<Row[]>(() => toRows(table.units));
  const [problems, setProblems] = useState<string[]>([]);
  const save = useMutation({
    mutationFn: (units: StratigraphyUnit[]) => apiFetch<StratigraphyView>(`/api/studies/${studyId}/stratigraphy`, { method: "PUT", json: { units } }),
    onSuccess: async (saved) => {
      queryClient.setQueryData(stratigraphyKey(studyId), saved);
      setEditing(false);
    },
    onError: (error) => {
      const details = error instanceof ApiRequestError ? error.details : undefined;
      const messages = [...Object.values(details?.fieldErrors ?? {}).flat(), ...((details?.formErrors as string[] | undefined) ?? [])];
      setProblems(messages.length ? messages : [error instanceof Error ? error.message : String(error)]);
    },
  });

  function start() {
    // a first table: one unit below each horizon of the cut-offs, to be named and marked
    setRows(
      table.units.length ? toRows(table.units) : horizons.map((horizon) => ({ name: `Unit below ${horizon}`, topHorizon: horizon, kind: "other", clay: "" })),
    );
    setProblems([]);
    setEditing(true);
  }

  function submit() {
    const units = rows.map((row) => ({
      name: row.name,
      topHorizon: row.topHorizon,
      kind: row.kind,
      clayFraction: row.clay.trim() === "" ? null : Number(row.clay),
    }));
    const checked = stratigraphySchema.safeParse({ units });
    if (!checked.success) {
      setProblems(checked.error.issues.map((issue) => (issue.path.length > 2 ? `Unit ${Number(issue.path[1]) + 1}: ${issue.message}` : issue.message)));
      return;
    }
    setProblems([]);
    save.mutate(checked.data.units);
  }

  const update = (index: number, patch: Partial<Row>) => setRows((current) => current.map((row, i) => (i === index ? { ...row, ...patch } : row)));
  const move = (index: number, by: number) =>
    setRows((current) => {
      const next = [...current];
      const [row] = next.splice(index, 1);
      next.splice(Math.max(0, Math.min(next.length, index + by)), 0, row);
      return next;
    });

  return (
    <section className="space-y-2 text-sm" data-testid="stratigraphy">
      <div className="flex flex-wrap items-baseline justify-between gap-2">
        <h4 className="font-semibold">Stratigraphy table (this study)</h4>
        <span className="text-xs text-slate-500">
          {table.version > 0 ? `version ${table.version}${table.updatedBy ? `, set by ${table.updatedBy.name}` : ""}` : "not set yet"}
        </span>
      </div>
      <p className="text-xs text-slate-500">
        Units from top to bottom; each reaches from the horizon at its top down to the next unit&apos;s top. The clay (shale) fraction, 0 to 1, feeds the shale
        gouge ratio.
      </p>
      {!editing ? (
        <>
          {table.units.length > 0 ? (
            <table className="w-full text-xs" data-testid="stratigraphy-table">
              <thead className="text-left text-slate-500">
                <tr>
                  <th className="py-1 font-medium">Unit</th>
                  <th className="py-1 font-medium">Top horizon</th>
                  <th className="py-1 font-medium">Kind</th>
                  <th className="py-1 text-right font-medium">Clay fraction</th>
                </tr>
              </thead>
              <tbody>
                {table.units.map((unit) => (
                  <tr key={unit.name} className="border-t border-slate-100 dark:border-slate-800">
                    <td className="py-1">{unit.name}</td>
                    <td className="py-1">{unit.topHorizon}</td>
                    <td className="py-1">{unit.kind}</td>
                    <td className="num py-1 text-right">{unit.clayFraction === null ? "unknown" : unit.clayFraction.toFixed(2)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          ) : (
            <p className="text-xs text-slate-500" data-testid="stratigraphy-empty">
              No units yet: the diagram shows the horizon traces only.
            </p>
          )}
          {canEdit && (
            <button type="button" className="btn-quiet px-2 py-1 text-xs" onClick={start} data-testid="stratigraphy-edit">
              {table.units.length ? "Edit the table" : "Fill in the table"}
            </button>
          )}
        </>
      ) : (
        <form
          className="space-y-2"
          onSubmit={(event) => {
            event.preventDefault();
            submit();
          }}
        >
          <datalist id="stratigraphy-horizons">
            {horizons.map((horizon) => (
              <option key={horizon} value={horizon} />
            ))}
          </datalist>
          <table className="w-full text-xs">
            <thead className="text-left text-slate-500">
              <tr>
                <th className="py-1 font-medium">Unit</th>
                <th className="py-1 font-medium">Top horizon</th>
                <th className="py-1 font-medium">Kind</th>
                <th className="py-1 font-medium">Clay fraction</th>
                <th />
              </tr>
            </thead>
            <tbody>
              {rows.map((row, index) => (
                <tr key={index} className="border-t border-slate-100 align-top dark:border-slate-800" data-testid="stratigraphy-row">
                  <td className="py-1 pr-1">
                    <input
                      className="field py-0.5 text-xs"
                      aria-label={`Unit ${index + 1} name`}
                      value={row.name}
                      onChange={(event) => update(index, { name: event.target.value })}
                    />
                  </td>
                  <td className="py-1 pr-1">
                    <input
                      className="field py-0.5 text-xs"
                      aria-label={`Unit ${index + 1} top horizon`}
                      list="stratigraphy-horizons"
                      value={row.topHorizon}
                      onChange={(event) => update(index, { topHorizon: event.target.value })}
                    />
                  </td>
                  <td className="py-1 pr-1">
                    <select
                      className="field py-0.5 text-xs"
                      aria-label={`Unit ${index + 1} kind`}
                      value={row.kind}
                      onChange={(event) => update(index, { kind: event.target.value as UnitKind })}
                    >
                      {UNIT_KINDS.map((kind) => (
                        <option key={kind} value={kind}>
                          {kind}
                        </option>
                      ))}
                    </select>
                  </td>
                  <td className="py-1 pr-1">
                    <input
                      className="field w-20 py-0.5 text-xs"
                      inputMode="decimal"
                      aria-label={`Unit ${index + 1} clay fraction`}
                      placeholder="unknown"
                      value={row.clay}
                      onChange={(event) => update(index, { clay: event.target.value })}
                    />
                  </td>
                  <td className="whitespace-nowrap py-1">
                    <button
                      type="button"
                      className="px-1 text-slate-500 hover:text-slate-900 disabled:opacity-30"
                      aria-label="Move up"
                      disabled={index === 0}
                      onClick={() => move(index, -1)}
                    >
                      ↑
                    </button>
                    <button
                      type="button"
                      className="px-1 text-slate-500 hover:text-slate-900 disabled:opacity-30"
                      aria-label="Move down"
                      disabled={index === rows.length - 1}
                      onClick={() => move(index, 1)}
                    >
                      ↓
                    </button>
                    <button
                      type="button"
                      className="px-1 text-slate-500 hover:text-red-700"
                      aria-label="Remove unit"
                      onClick={() => setRows((current) => current.filter((_, i) => i !== index))}
                    >
                      ×
                    </button>
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
          <button
            type="button"
            className="btn-quiet px-2 py-0.5 text-xs"
            onClick={() => setRows((current) => [...current, { name: "", topHorizon: "", kind: "other", clay: "" }])}
          >
            Add a unit
          </button>
          {problems.length > 0 && (
            <ul className="list-disc pl-5 text-xs text-red-700 dark:text-red-300" data-testid="stratigraphy-problems">
              {problems.map((problem) => (
                <li key={problem}>{problem}</li>
              ))}
            </ul>
          )}
          <div className="flex gap-2">
            <button type="submit" className="btn-primary py-1 text-xs" disabled={save.isPending} data-testid="stratigraphy-save">
              {save.isPending ? "Saving…" : "Save the table"}
            </button>
            <button type="button" className="btn-quiet py-1 text-xs" onClick={() => setEditing(false)}>
              Cancel
            </button>
          </div>
        </form>
      )}
    </section>
  );
}
