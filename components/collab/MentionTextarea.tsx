"use client";
// A note or reply box that offers the study's people while an @handle is being typed: arrow keys or the mouse to
// choose, Enter or Tab to insert "@handle ", Escape to close.
import { useId, useMemo, useRef, useState, type TextareaHTMLAttributes } from "react";
import { mentionBeforeCaret, mentionSuggestions, type Mentionable } from "@/lib/pins/text";

export type { Mentionable };

type Props = Omit<TextareaHTMLAttributes<HTMLTextAreaElement>, "value" | "onChange"> & {
  value: string;
  onValueChange: (value: string) => void;
  mentionable: Mentionable[];
};

export function MentionTextarea({ value, onValueChange, mentionable, onKeyDown, ...textareaProps }: Props) {
  const ref = useRef<HTMLTextAreaElement>(null);
  const listId = useId();
  const [caret, setCaret] = useState(0);
  const [active, setActive] = useState(0);
  const [dismissedAt, setDismissedAt] = useState<number | null>(null);
  const mention = mentionBeforeCaret(value, caret);
  const query = mention?.query ?? null;
  const suggestions = useMemo(() => (query !== null ? mentionSuggestions(mentionable, query) : []), [query, mentionable]);
  const open = mention !== null && suggestions.length > 0 && dismissedAt !== mention.start;
  const chosen = Math.min(active, Math.max(0, suggestions.length - 1));

  const insert = (person: Mentionable) => {
    if (!mention) return;
    const before = value.slice(0, mention.start);
    const after = value.slice(caret).replace(/^[\w.-]*/, "");
    const inserted = `@${person.handle} `;
    const next = before + inserted + after.replace(/^ /, "");
    const position = before.length + inserted.length;
    onValueChange(next);
    setCaret(position);
    setActive(0);
    requestAnimationFrame(() => {
      ref.current?.focus();
      ref.current?.setSelectionRange(position, position);
    });
  };

  return (
    <div className="relative">
      <textarea
        {...textareaProps}
        ref={ref}
        value={value}
        role="combobox"
        aria-autocomplete="list"
        aria-expanded={open}
        aria-controls={open ? listId : undefined}
        aria-activedescendant={open ? `${listId}-${chosen}` : undefined}
        onChange={(event) => {
          onValueChange(event.target.value);
          setCaret(event.target.selectionStart ?? event.target.value.length);
          setActive(0);
        }}
        onSelect={(event) => setCaret(event.currentTarget.selectionStart ?? 0)}
        onKeyDown={(event) => {
          if (open) {
            if (event.key === "ArrowDown" || event.key === "ArrowUp") {
              event.preventDefault();
              const step = event.key === "ArrowDown" ? 1 : -1;
              setActive((chosen + step + suggestions.length) % suggestions.length);
              return;
            }
            if (event.key === "Enter" || event.key === "Tab") {
              event.preventDefault();
              insert(suggestions[chosen]);
              return;
            }
            if (event.key === "Escape") {
              event.preventDefault();
              setDismissedAt(mention!.start);
              return;
            }
          }
          onKeyDown?.(event);
        }}
      />
      {open && (
        <ul
          id={listId}
          role="listbox"
          aria-label="People to mention"
          className="absolute left-0 right-0 z-20 mt-1 max-h-48 overflow-auto rounded-lg border border-slate-200 bg-white py-1 text-sm shadow-lg dark:border-slate-700 dark:bg-slate-900"
          data-testid="mention-list"
        >
          {suggestions.map((person, index) => (
            <li
              key={person.handle}
              id={`${listId}-${index}`}
              role="option"
              aria-selected={index === chosen}
              className={`flex cursor-pointer items-baseline justify-between gap-3 px-3 py-1.5 ${index === chosen ? "bg-slip-50 dark:bg-slip-950" : ""}`}
              onMouseDown={(event) => {
                event.preventDefault(); // keep the focus in the text box
                insert(person);
              }}
              onMouseEnter={() => setActive(index)}
              data-testid="mention-option"
            >
              <span className="font-mono">@{person.handle}</span>
              <span className="truncate text-xs text-slate-500">{person.name}</span>
            </li>
          ))}
        </ul>
      )}
    </div>
  );
}
