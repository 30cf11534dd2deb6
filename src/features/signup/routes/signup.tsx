/** Public sign-up of a new workshop by its owner; then a link is e-mailed to confirm the owner's address. */
import { useState } from 'react';
import type { SignupResult } from '@shared/schemas/signup';
import { Alert } from '@/components/alert';
import { Frame } from '@/components/signed-out-frame';
import { ResendLink } from '../components/resend-link';
import { SignupForm } from '../components/signup-form';

export function SignupPage() {
  const [done, setDone] = useState<SignupResult>();
  if (done) {
    return (
      <Frame title="Look in your inbox" intro="One step left: confirm your e-mail address.">
        <Alert tone="info" title="Confirmation link sent">
          {done.message}
        </Alert>
        <p className="text-sm text-walnut-700">No message after a few minutes? Look in the spam folder, or ask for a new link.</p>
        <ResendLink email={done.email} />
      </Frame>
    );
  }
  return (
    <Frame wide title="Sign up your workshop" intro="A workshop of its own: your price list, finishing systems, customers and drying room, seen by you and the staff you add.">
      <SignupForm onDone={setDone} />
    </Frame>
  );
}

export { SignupPage as Component };
