/**
 * A form's unsaved work kept in this browser (localStorage), so that what was typed survives a dropped connection,
 * a closed tab or a flat battery: written on every change once the user has changed something, offered again on
 * return, and cleared when the work is saved to the server or discarded.
 */
import { useCallback, useDeferredValue, useEffect, useMemo, useState, useSyncExternalStore } from 'react';

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
 * The draft kept under `key` on arrival (if it differs from what the page starts with), and `dismiss` to stop
 * offering it. What is typed is kept by a `BrowserDraftKeeper` beside the form.
 */
export function useBrowserDraft<T>(key: string | undefined, initial: T) {
  const [found, setFound] = useState<StoredDraft<T> | null>(() => {
    if (!key) return null;
    const stored = read<T>(key);
    return stored && JSON.stringify(stored.value) !== JSON.stringify(initial) ? stored : null;
  });
  const dismiss = useCallback(() => setFound(null), []);
  return { found, dismiss };
}

/**
 * Keeps `value` under `key` whenever it differs from `initial`. It follows the typing a frame behind, on a deferred
 * value: writing a long form to storage (and comparing it) is not part of a keystroke's frame. Renders nothing.
 */
export function BrowserDraftKeeper<T>({ draftKey, value, initial }: { draftKey: string | undefined; value: T; initial: T }): null {
  const latest = useDeferredValue(value);
  const initialText = useMemo(() => JSON.stringify(initial), [initial]);
  useEffect(() => {
    if (!draftKey) return;
    const text = JSON.stringify(latest);
    if (text === initialText) return;
    try {
      window.localStorage.setItem(PREFIX + draftKey, `{"savedAt":${JSON.stringify(new Date().toISOString())},"value":${text}}`);
    } catch {
      // A full or disabled storage only loses the safety net, never the form.
    }
  }, [draftKey, latest, initialText]);
  return null;
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
