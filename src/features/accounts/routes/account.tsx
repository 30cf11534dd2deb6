import { useParams } from 'react-router-dom';
import { PageHeader } from '@/components/card';
import { AccountPanel } from '../components/account-panel';

/** A job's account, by its accepted quote: invoices, receipts, credit notes, payments and the balance. */
export function AccountPage() {
  const quoteId = Number(useParams().quoteId);
  return (
    <>
      <PageHeader title="Job account" description="What was agreed, what has been paid and what is still owed. Every document goes to the customer by e-mail as it is issued." />
      <AccountPanel quoteId={Number.isInteger(quoteId) ? quoteId : 0} />
    </>
  );
}

export const Component = AccountPage;
