import { useRef, type KeyboardEvent } from 'react';
import { tabAfterKey } from './tab-keys';

export interface TabItem<K extends string> {
  id: K;
  label: string;
}

/**
 * A row of tabs that works from the keyboard: one tab stop for the strip, arrow keys (and
 * Home/End) move to and select the neighbouring tab. `look` picks buttons or folder tabs.
 */
export default function TabStrip<K extends string>({
  tabs,
  selected,
  onSelect,
  label,
  look = 'buttons',
  className = '',
}: {
  tabs: readonly TabItem<K>[];
  selected: K;
  onSelect: (id: K) => void;
  label: string;
  look?: 'buttons' | 'folder';
  className?: string;
}) {
  const refs = useRef<(HTMLButtonElement | null)[]>([]);
  function onKeyDown(e: KeyboardEvent<HTMLButtonElement>, index: number) {
    const next = tabAfterKey(e.key, index, tabs.length);
    if (next === null) return;
    e.preventDefault();
    onSelect(tabs[next]!.id);
    refs.current[next]?.focus();
  }
  return (
    <div role="tablist" aria-label={label} className={`flex flex-wrap gap-1 ${look === 'folder' ? 'border-b border-paper-line' : ''} ${className}`}>
      {tabs.map((t, i) => {
        const on = t.id === selected;
        const cls =
          look === 'folder'
            ? `-mb-px rounded-t border px-4 py-1.5 text-sm font-semibold ${on ? 'border-paper-line border-b-paper-raised bg-paper-raised text-channel-700' : 'border-transparent text-ink-soft hover:text-ink'}`
            : on
              ? 'btn-primary'
              : 'btn-quiet';
        return (
          <button
            key={t.id}
            ref={(el) => {
              refs.current[i] = el;
            }}
            type="button"
            role="tab"
            aria-selected={on}
            tabIndex={on ? 0 : -1}
            className={cls}
            onClick={() => onSelect(t.id)}
            onKeyDown={(e) => onKeyDown(e, i)}
          >
            {t.label}
          </button>
        );
      })}
    </div>
  );
}
