import { fireEvent, render, screen, within } from '@testing-library/react';
import { describe, expect, it, vi } from 'vitest';
import { DataTable, type Column } from '../../src/components/data-table';

interface Row { id: number; name: string; hours: number }
const columns: Column<Row>[] = [
  { key: 'name', header: 'Name', sortKey: 'name', render: (r) => r.name },
  { key: 'hours', header: 'Hours', sortKey: 'hours', align: 'right', render: (r) => `${r.hours} h` },
];

describe('DataTable', () => {
  it('shows rows, the range and page count, and marks the sorted column', () => {
    render(
      <DataTable caption="Jobs" columns={columns} rows={[{ id: 1, name: 'Lid', hours: 3 }]} rowKey={(r) => r.id} total={51} page={2} pageSize={25} sort="hours" dir="desc" onPage={() => {}} onSort={() => {}} />,
    );
    expect(screen.getByText('26–50 of 51')).toBeTruthy();
    expect(screen.getByText('Page 2 of 3')).toBeTruthy();
    const hours = screen.getByRole('columnheader', { name: /hours/i });
    expect(hours.getAttribute('aria-sort')).toBe('descending');
    expect(screen.getByRole('columnheader', { name: /name/i }).getAttribute('aria-sort')).toBeNull();
  });

  it('asks for another sort and page, and disables paging past the ends', () => {
    const onSort = vi.fn();
    const onPage = vi.fn();
    render(<DataTable caption="Jobs" columns={columns} rows={[]} rowKey={(r) => r.id} total={10} page={1} pageSize={25} onPage={onPage} onSort={onSort} empty="No jobs" />);
    fireEvent.click(within(screen.getByRole('columnheader', { name: /name/i })).getByRole('button'));
    expect(onSort).toHaveBeenCalledWith('name');
    expect((screen.getByRole('button', { name: 'Previous page' }) as HTMLButtonElement).disabled).toBe(true);
    expect((screen.getByRole('button', { name: 'Next page' }) as HTMLButtonElement).disabled).toBe(true);
    expect(screen.getByText('No jobs')).toBeTruthy();
    expect(onPage).not.toHaveBeenCalled();
  });

  it('says "more than" when the server stopped counting, and lets the user page on', () => {
    const onPage = vi.fn();
    render(<DataTable caption="Jobs" columns={columns} rows={[{ id: 1, name: 'Lid', hours: 3 }]} rowKey={(r) => r.id} total={250} totalCapped page={10} pageSize={25} onPage={onPage} />);
    expect(screen.getByText('226–250 of more than 250')).toBeTruthy();
    expect(screen.getByText('Page 10 of more than 10')).toBeTruthy();
    fireEvent.click(screen.getByRole('button', { name: 'Next page' }));
    expect(onPage).toHaveBeenCalledWith(11);
  });
});
