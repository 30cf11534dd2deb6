/**
 * A form's unsaved work kept in this browser (localStorage), so that what was typed survives a dropped connection,
 * a closed tab or a flat battery: written on every change once the user has changed something, offered again on
 * return, and cleared when the work is saved to the server or discarded.
 */
import { useCallback, useEffect, useMemo, useState, useSyncExternalStore } from 'react';

const PREFIX = 'shellwright:draft:';

export interface StoredDraft<T> {
  savedAt: string;
  value: T;
}

function read<T>(key: string): StoredDraft<T> | null {
  try {
    const raw = window.localStorage.getItem(PREFIX + key);
    if (!raw) return null;
    const parsed = JSON.parse(raw) as StoredDraft<T>;
    return parsed && typeof parsed.savedAt === 'string' && 'value' in parsed ? parsed : null;
  } catch {
    return null;
  }
}

/** Forgets the draft kept under `key` (after the server saved the work). */
export function clearBrowserDraft(key: string): void {
  try {
    window.localStorage.removeItem(PREFIX + key);
  } catch {
    // Storage may be off (private mode): there is nothing kept to forget.
  }
}

/**
 * Keeps `value` under `key` whenever it differs from `initial`. Returns the draft found on arrival (if it differs
 * from what the page starts with), and `dismiss` to stop offering it.
 */
export function useBrowserDraft<T>(key: string | undefined, value: T, initial: T) {
  const [found, setFound] = useState<StoredDraft<T> | null>(() => {
    if (!key) return null;
    const stored = read<T>(key);
    return stored && JSON.stringify(stored.value) !== JSON.stringify(initial) ? stored : null;
  });
  // Worked out once per value, not on every render of the form (a long form re-renders on every keystroke).
  const changed = useMemo(() => JSON.stringify(value) !== JSON.stringify(initial), [value, initial]);
  useEffect(() => {
    if (!key || !changed) return;
    try {
      window.localStorage.setItem(PREFIX + key, JSON.stringify({ savedAt: new Date().toISOString(), value } satisfies StoredDraft<T>));
    } catch {
      // A full or disabled storage only loses the safety net, never the form.
    }
  }, [key, value, changed]);
  const dismiss = useCallback(() => setFound(null), []);
  return { found, dismiss };
}

function subscribe(onChange: () => void): () => void {
  window.addEventListener('online', onChange);
  window.addEventListener('offline', onChange);
  return () => {
    window.removeEventListener('online', onChange);
    window.removeEventListener('offline', onChange);
  };
}

/** Whether the browser believes it is connected. */
export function useOnline(): boolean {
  return useSyncExternalStore(subscribe, () => navigator.onLine, () => true);
}
