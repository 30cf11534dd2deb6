import { useCallback, useState } from 'react';
import { UNIT_SYSTEMS, type UnitSystem } from '@shared/units';
import { useMe } from '@/lib/me';

const KEY = 'shellwright.displayUnits';

function read(key: string): UnitSystem | null {
  try {
    const v = window.localStorage.getItem(key);
    return (UNIT_SYSTEMS as readonly string[]).includes(v ?? '') ? (v as UnitSystem) : null;
  } catch {
    return null;
  }
}

/**
 * Metric or imperial display: the workshop's setting unless this user has chosen otherwise on this browser.
 */
export function useDisplayUnits(workshopUnits: UnitSystem): [UnitSystem, (u: UnitSystem) => void] {
  const userId = useMe().data?.id ?? 0;
  const key = `${KEY}.${userId}`;
  const [chosen, setChosen] = useState<{ key: string; value: UnitSystem | null }>(() => ({ key, value: read(key) }));
  const value = chosen.key === key ? chosen.value : read(key);
  const set = useCallback(
    (u: UnitSystem) => {
      try {
        window.localStorage.setItem(key, u);
      } catch {
        // Private browsing: the choice lasts for this page only.
      }
      setChosen({ key, value: u });
    },
    [key],
  );
  return [value ?? workshopUnits, set];
}
