/**
 * The e-mailed confirmation link. The address is confirmed when the owner presses the button (not on opening the
 * page, so that a mail program that opens links to check them does not spend it).
 */
import { Link, useParams } from 'react-router-dom';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { paths } from '@/config/paths';
import { ApiError } from '@/lib/api';
import { useConfirmEmail } from '../api/signup';
import { Frame } from '@/components/signed-out-frame';
import { ResendLink } from '../components/resend-link';

export function ConfirmEmailPage() {
  const { token = '' } = useParams();
  const confirm = useConfirmEmail();
  const used = confirm.error instanceof ApiError && confirm.error.code === 'confirmation_link_used';

  if (confirm.isSuccess || used) {
    return (
      <Frame title="Address confirmed" intro="Your workshop is ready for you.">
        <Alert tone="info" title={used ? 'This link was already used' : 'Thank you'}>
          {used ? 'The address is confirmed. ' : `${confirm.data?.email} is confirmed. `}
          <Link to={paths.signIn} className="font-semibold underline">
            Sign in
          </Link>{' '}
          with it and the password you chose.
        </Alert>
      </Frame>
    );
  }
  return (
    <Frame title="Confirm your e-mail address" intro="Press the button to confirm the address you signed up with.">
      {confirm.isError && (
        <Alert tone="error" title="The link does not work">
          {confirm.error.message}
        </Alert>
      )}
      <Button type="button" className="w-full" busy={confirm.isPending} onClick={() => confirm.mutate({ token })}>
        Confirm my address
      </Button>
      {confirm.isError && <ResendLink />}
    </Frame>
  );
}

export { ConfirmEmailPage as Component };
