import { Plus } from 'lucide-react';
import { useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import type { Customer } from '@shared/schemas/customers';
import { Button } from '@/components/button';
import { PageHeader } from '@/components/card';
import type { Column } from '@/components/data-table';
import { SearchBox } from '@/components/search-box';
import { PagedTable } from '@/components/paged-table';
import { pathTo } from '@/config/paths';
import { useCan } from '@/lib/permissions';
import { useTableState } from '@/lib/use-table-state';
import { useCustomers, type CustomerListQueryInput } from '../api/customers';
import { CustomerFormDialog } from '../components/customer-form-dialog';

const PAGE_SIZE = 25;

/** The workshop's customers: searched, sorted and paged on the server, so ten thousand are as quick as ten. */
export function CustomersPage() {
  const table = useTableState({ sort: 'name', filters: ['archived'] });
  const [adding, setAdding] = useState(false);
  const can = useCan();
  const navigate = useNavigate();
  const archived = table.state.filters.archived === 'true';
  const query: CustomerListQueryInput = {
    q: table.state.q || undefined,
    sort: table.state.sort as CustomerListQueryInput['sort'],
    dir: table.state.dir,
    archived: archived ? 'true' : undefined,
    page: table.state.page,
    pageSize: PAGE_SIZE,
  };
  const customers = useCustomers(query);
  const columns: Column<Customer>[] = [
    {
      key: 'name',
      header: 'Name',
      sortKey: 'name',
      render: (c) => (
        <Link to={pathTo.customer(c.id)} className="font-medium text-walnut-900 underline decoration-amber-400 underline-offset-2 hover:text-amber-700">
          {c.name}
        </Link>
      ),
    },
    { key: 'contact', header: 'Contact', render: (c) => <span className="text-walnut-700">{[c.email, c.phone].filter(Boolean).join(' · ') || '—'}</span> },
    { key: 'pieces', header: 'Pieces', align: 'right', render: (c) => c.pieceCount },
    { key: 'estimates', header: 'Estimates', align: 'right', render: (c) => c.estimateCount },
    { key: 'createdAt', header: 'Added', sortKey: 'createdAt', render: (c) => <span className="num text-walnut-600">{new Date(c.createdAt).toLocaleDateString('en-GB', { dateStyle: 'medium' })}</span> },
    { key: 'updatedAt', header: 'Updated', sortKey: 'updatedAt', render: (c) => <span className="num text-walnut-600">{new Date(c.updatedAt).toLocaleDateString('en-GB', { dateStyle: 'medium' })}</span> },
  ];
  return (
    <>
      <PageHeader
        title="Customers"
        description="The people and firms whose pieces the workshop polishes. Open one to see their pieces and estimates."
        actions={
          can.editCustomers && (
            <Button onClick={() => setAdding(true)}>
              <Plus className="h-4 w-4" aria-hidden /> Add customer
            </Button>
          )
        }
      />
      <div className="mb-4 flex flex-wrap items-center gap-3">
        <SearchBox value={table.state.q} onSearch={table.setSearch} label="Search customers by name, e-mail or telephone" placeholder="Search name, e-mail or telephone" className="w-80" />
        <label className="inline-flex items-center gap-2 text-sm text-walnut-700">
          <input type="checkbox" className="h-4 w-4 accent-amber-600" checked={archived} onChange={(e) => table.setFilter('archived', e.target.checked ? 'true' : '')} />
          Archived customers
        </label>
      </div>
      <PagedTable
        caption="Customers"
        columns={columns}
        rowKey={(c) => c.id}
        query={customers}
        table={table}
        pageSize={PAGE_SIZE}
        empty={table.state.q ? 'No customer matches that search.' : 'No customers yet.'}
        errorTitle="Customers could not be loaded"
      />
      <CustomerFormDialog open={adding} onClose={() => setAdding(false)} onSaved={(c) => navigate(pathTo.customer(c.id))} />
    </>
  );
}
