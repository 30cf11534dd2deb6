import { describe, expect, it } from 'vitest';
import { assignLanes } from '../../../src/features/planning/lib/lanes';

const job = (id: number, start: string, end: string, rows = 1) => ({ id, start, end, rows });

describe('assignLanes (bay rows on the board)', () => {
  it('puts jobs that do not overlap in the same row', () => {
    const { placed, count } = assignLanes([job(1, '2027-01-04T08:00', '2027-01-10T12:00'), job(2, '2027-01-10T12:00', '2027-01-20T08:00')]);
    expect(count).toBe(1);
    expect(placed.map((p) => p.lanes)).toEqual([[0], [0]]);
  });

  it('gives a job that takes two bays the two lowest free rows', () => {
    const { placed, count } = assignLanes([job(1, '2027-01-04T08:00', '2027-02-01T08:00'), job(2, '2027-01-05T08:00', '2027-01-20T08:00', 2)]);
    expect(count).toBe(3);
    expect(placed.find((p) => p.item.id === 2)?.lanes).toEqual([1, 2]);
  });

  it('opens rows beyond the room when the board is overbooked, and does not mutate its input', () => {
    const items = [job(3, '2027-01-04T08:00', '2027-01-09T08:00'), job(1, '2027-01-04T08:00', '2027-01-09T08:00'), job(2, '2027-01-04T08:00', '2027-01-09T08:00')];
    const copy = structuredClone(items);
    const { placed, count } = assignLanes(items);
    expect(count).toBe(3);
    expect(placed.map((p) => p.item.id)).toEqual([1, 2, 3]);
    expect(items).toEqual(copy);
  });
});
