import { useId, useMemo, useState, type KeyboardEvent } from 'react';
import { partKindLabels, type Part } from '@shared/schemas/parts';
import { TextField } from '@/components/ui/field';
import { formatPs } from '@/utils/format';

/** How a part reads in the picker and on its field: tag, description and delay. */
export function partLabel(part: Part): string {
  return `${part.tag} · ${part.description || partKindLabels[part.kind]} · ${formatPs(part.delayPs)}`;
}

const MAX_SHOWN = 40;

interface PartPickerProps {
  label: string;
  parts: Part[];
  value: number | null;
  onChange: (partId: number) => void;
  onBlur?: () => void;
  error?: string;
}

/**
 * A searchable list of inventory parts (ARIA combobox): type to filter by tag, description or kind, move with
 * the arrow keys, pick with Enter or a click; Escape puts back the part that was chosen.
 */
export function PartPicker({ label, parts, value, onChange, onBlur, error }: PartPickerProps) {
  const listId = useId();
  const chosen = parts.find((p) => p.id === value) ?? null;
  const [query, setQuery] = useState<string | null>(null);
  const [active, setActive] = useState(0);
  const open = query !== null;

  const matches = useMemo(() => {
    const words = (query ?? '').toLowerCase().split(/\s+/).filter(Boolean);
    return parts.filter((p) => words.every((w) => `${p.tag} ${p.description} ${partKindLabels[p.kind]}`.toLowerCase().includes(w))).slice(0, MAX_SHOWN);
  }, [parts, query]);

  const pick = (part: Part | undefined) => {
    if (part) onChange(part.id);
    setQuery(null);
  };
  const onKeyDown = (event: KeyboardEvent<HTMLInputElement>) => {
    if (event.key === 'ArrowDown' || event.key === 'ArrowUp') {
      event.preventDefault();
      if (!open) {
        setQuery('');
        setActive(0);
        return;
      }
      const step = event.key === 'ArrowDown' ? 1 : -1;
      setActive((i) => (matches.length ? (i + step + matches.length) % matches.length : 0));
    } else if (event.key === 'Enter' && open) {
      // Enter picks; it must not submit the setup form.
      event.preventDefault();
      pick(matches[active]);
    } else if (event.key === 'Escape' && open) {
      event.preventDefault();
      setQuery(null);
    }
  };

  return (
    <div className="relative">
      <TextField
        label={label}
        role="combobox"
        autoComplete="off"
        aria-autocomplete="list"
        aria-expanded={open}
        aria-controls={listId}
        aria-activedescendant={open && matches[active] ? `${listId}-${matches[active].id}` : undefined}
        placeholder="Type a tag or description…"
        value={open ? query : chosen ? partLabel(chosen) : ''}
        error={error}
        onFocus={(e) => {
          e.target.select();
        }}
        onChange={(e) => {
          setQuery(e.target.value);
          setActive(0);
        }}
        onKeyDown={onKeyDown}
        onBlur={() => {
          setQuery(null);
          onBlur?.();
        }}
      />
      {open ? (
        <ul
          id={listId}
          role="listbox"
          aria-label={`${label}: parts`}
          className="absolute left-0 right-0 z-20 mt-1 max-h-72 overflow-auto rounded-chip bg-white py-1 shadow-lifted ring-1 ring-ink-200"
        >
          {matches.length === 0 ? <li className="px-3 py-2 text-body text-ink-500">No part matches.</li> : null}
          {matches.map((part, i) => (
            <li
              key={part.id}
              id={`${listId}-${part.id}`}
              role="option"
              aria-selected={i === active}
              // mousedown, not click: the input must not lose focus (and close the list) before the pick.
              onMouseDown={(e) => {
                e.preventDefault();
                pick(part);
              }}
              onMouseEnter={() => setActive(i)}
              className={`flex cursor-pointer items-baseline gap-2 px-3 py-1.5 text-body ${i === active ? 'bg-phase-50' : ''}`}
            >
              <span className="font-mono font-semibold text-ink-800">{part.tag}</span>
              <span className="min-w-0 flex-1 truncate text-ink-600">{part.description || partKindLabels[part.kind]}</span>
              {part.status !== 'ok' ? <span className="text-caption font-semibold text-caution-700">{part.status}</span> : null}
              <span className="whitespace-nowrap tabular-nums text-caption text-ink-500">{formatPs(part.delayPs)}</span>
            </li>
          ))}
        </ul>
      ) : null}
    </div>
  );
}
