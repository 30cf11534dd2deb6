/**
 * Rows of the drying room on the board: each job gets as many bay rows as it takes, the lowest free ones, for its
 * whole time in the room. Rows beyond the room's capacity only appear when the board is overbooked.
 */
export interface LaneItem {
  id: number;
  start: string;
  end: string;
  /** Rows it takes: its bays in bay mode, one row in area mode. */
  rows: number;
}

export interface Placed<T> {
  item: T;
  lanes: number[];
}

/** Places items in rows, earliest first; an item that takes several rows takes the lowest free ones. */
export function assignLanes<T extends LaneItem>(items: readonly T[]): { placed: Placed<T>[]; count: number } {
  const busyUntil: string[] = [];
  const placed: Placed<T>[] = [];
  const sorted = [...items].sort((a, b) => a.start.localeCompare(b.start) || a.id - b.id);
  for (const item of sorted) {
    const lanes: number[] = [];
    for (let lane = 0; lanes.length < item.rows; lane++) {
      if (busyUntil[lane] === undefined || busyUntil[lane]! <= item.start) lanes.push(lane);
    }
    for (const lane of lanes) busyUntil[lane] = item.end;
    placed.push({ item, lanes });
  }
  return { placed, count: busyUntil.length };
}
