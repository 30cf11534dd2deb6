import { Search } from 'lucide-react';
import { useEffect, useId, useState } from 'react';

export interface SearchBoxProps {
  /** The search in force (from the address bar). */
  value: string;
  onSearch: (q: string) => void;
  /** What is searched, read out to screen readers and shown above the box when `showLabel`. */
  label: string;
  placeholder: string;
  showLabel?: boolean;
  className?: string;
}

/** A search field for a server-side table: searches on Enter or when it loses focus. */
export function SearchBox({ value, onSearch, label, placeholder, showLabel = false, className = 'w-80' }: SearchBoxProps) {
  const id = useId();
  const [text, setText] = useState(value);
  useEffect(() => setText(value), [value]);
  const submit = () => {
    if (text.trim() !== value) onSearch(text.trim());
  };
  return (
    <form
      role="search"
      className="relative"
      onSubmit={(e) => {
        e.preventDefault();
        submit();
      }}
    >
      <label htmlFor={id} className={showLabel ? 'block text-xs font-medium uppercase tracking-wide text-walnut-600' : 'sr-only'}>
        {showLabel ? 'Search' : label}
      </label>
      <Search className={`pointer-events-none absolute left-2.5 h-4 w-4 text-walnut-400 ${showLabel ? 'top-7' : 'top-2.5'}`} aria-hidden />
      <input
        id={id}
        type="search"
        title={label}
        placeholder={placeholder}
        value={text}
        onChange={(e) => setText(e.target.value)}
        onBlur={submit}
        className={`${showLabel ? 'mt-0.5 ' : ''}max-w-full rounded-md border border-walnut-200 bg-white py-2 pl-8 pr-3 text-sm ${className}`}
      />
    </form>
  );
}
