import { Search, X } from 'lucide-react';
import { useEffect, useId, useState } from 'react';
import { useCustomer, useCustomers } from '../api/customers';

/**
 * Picks one customer by typing part of the name: the server searches (there may be thousands), the first matches
 * are offered. Shows the chosen customer with a button to clear it.
 */
export function CustomerPicker({ value, onChange, label = 'Customer' }: { value: number | undefined; onChange: (id: number | undefined) => void; label?: string }) {
  const id = useId();
  const chosen = useCustomer(value);
  const [text, setText] = useState('');
  const [q, setQ] = useState('');
  const [open, setOpen] = useState(false);
  useEffect(() => {
    const t = setTimeout(() => setQ(text.trim()), 200);
    return () => clearTimeout(t);
  }, [text]);
  const matches = useCustomers({ q: q || undefined, pageSize: 8, sort: 'name', dir: 'asc' }, { enabled: open && value === undefined });

  if (value !== undefined) {
    return (
      <div>
        <span className="block text-xs font-medium uppercase tracking-wide text-walnut-600">{label}</span>
        <span className="mt-0.5 inline-flex items-center gap-1 rounded-md border border-amber-400 bg-amber-50 py-1.5 pl-3 pr-1 text-sm text-walnut-900">
          {chosen.data?.name ?? `Customer ${value}`}
          <button type="button" onClick={() => onChange(undefined)} className="rounded p-1 hover:bg-amber-100" aria-label={`Clear the ${label.toLowerCase()} filter`}>
            <X className="h-3.5 w-3.5" aria-hidden />
          </button>
        </span>
      </div>
    );
  }
  return (
    <div className="relative">
      <label htmlFor={id} className="block text-xs font-medium uppercase tracking-wide text-walnut-600">
        {label}
      </label>
      <Search className="pointer-events-none absolute left-2.5 top-7 h-4 w-4 text-walnut-400" aria-hidden />
      <input
        id={id}
        role="combobox"
        aria-expanded={open}
        aria-controls={`${id}-list`}
        aria-autocomplete="list"
        placeholder="Any customer"
        value={text}
        onChange={(e) => {
          setText(e.target.value);
          setOpen(true);
        }}
        onFocus={() => setOpen(true)}
        onBlur={() => setTimeout(() => setOpen(false), 150)}
        className="mt-0.5 w-56 rounded-md border border-walnut-200 bg-white py-2 pl-8 pr-3 text-sm"
      />
      {open && (
        <ul id={`${id}-list`} role="listbox" className="absolute z-20 mt-1 max-h-64 w-72 overflow-auto rounded-md border border-walnut-200 bg-white py-1 text-sm shadow-card">
          {(matches.data?.rows ?? []).map((c) => (
            <li
              key={c.id}
              role="option"
              aria-selected={false}
              onMouseDown={(e) => {
                e.preventDefault();
                onChange(c.id);
                setText('');
                setOpen(false);
              }}
              className="cursor-pointer px-3 py-1.5 hover:bg-parchment-100"
            >
              {c.name}
              {c.email && <span className="block text-xs text-walnut-500">{c.email}</span>}
            </li>
          ))}
          {matches.data && matches.data.rows.length === 0 && <li className="px-3 py-1.5 text-walnut-500">No customer matches.</li>}
          {!matches.data && <li className="px-3 py-1.5 text-walnut-500">Searching…</li>}
        </ul>
      )}
    </div>
  );
}
