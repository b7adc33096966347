"use client";
import { useActionState } from "react";
import { saveNotifySettings, type NotifySettingsState } from "@/app/settings/actions";

const OPTIONS = [
  { value: "immediate", title: "Immediately", hint: "One e-mail for each reply, mention or resolved pin." },
  { value: "digest", title: "Daily digest", hint: "One e-mail a day listing everything since the last one." },
  { value: "off", title: "Off", hint: "No e-mail; you still see unread markers in the workspace." },
] as const;

export function NotifySettingsForm({ initialMode }: { initialMode: "immediate" | "digest" | "off" }) {
  const [state, action, pending] = useActionState<NotifySettingsState, FormData>(saveNotifySettings, {});
  const current = state.mode ?? initialMode;
  return (
    <form action={action} className="mt-4 space-y-3" data-testid="notify-settings">
      <fieldset className="space-y-2">
        <legend className="label">Send me e-mail</legend>
        {OPTIONS.map((option) => (
          <label
            key={option.value}
            className="flex cursor-pointer items-start gap-3 rounded-lg border border-slate-200 p-3 hover:border-slip-400 dark:border-slate-700"
          >
            <input
              type="radio"
              name="notifyMode"
              value={option.value}
              defaultChecked={current === option.value}
              className="mt-1 accent-slip-600"
              data-testid={`notify-${option.value}`}
            />
            <span>
              <span className="block text-sm font-medium">{option.title}</span>
              <span className="block text-sm text-slate-500">{option.hint}</span>
            </span>
          </label>
        ))}
      </fieldset>
      <div className="flex items-center gap-3">
        <button className="btn-primary" disabled={pending} data-testid="notify-save">
          {pending ? "Saving…" : "Save"}
        </button>
        {state.message && (
          <p role="status" className={state.ok ? "text-sm text-slip-700 dark:text-slip-300" : "field-error mt-0"} data-testid="notify-message">
            {state.message}
          </p>
        )}
      </div>
    </form>
  );
}
