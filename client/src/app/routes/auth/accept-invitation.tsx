import { Link, useNavigate, useSearchParams } from 'react-router-dom';
import { PublicFrame } from '@/components/layout/app-shell';
import { Loading, Notice } from '@/components/ui/notice';
import { useInvitation } from '@/features/auth/api/get-invitation';
import { AcceptInvitationForm } from '@/features/auth/components/accept-invitation-form';
import { isApiError } from '@/lib/api-client';
import { homeFor } from '@/lib/permissions';

export function Component() {
  const [search] = useSearchParams();
  const navigate = useNavigate();
  const token = search.get('token') ?? '';
  const invitation = useInvitation(token);

  let body: React.ReactNode;
  if (!token) {
    body = <Notice tone="problem" title="This link is incomplete">Open the link from the invitation e-mail again.</Notice>;
  } else if (invitation.isPending) {
    body = <Loading label="Checking your invitation…" />;
  } else if (invitation.isError) {
    body = (
      <Notice tone="problem" title="This invitation cannot be used">
        <p>
          {isApiError(invitation.error) && invitation.error.status === 401
            ? 'It has already been accepted, has expired, or was replaced by a newer one. Ask the workshop to send it again.'
            : isApiError(invitation.error)
              ? invitation.error.message
              : 'Please try again in a moment.'}
        </p>
        <p>
          Already joined? <Link to="/sign-in">Sign in</Link>.
        </p>
      </Notice>
    );
  } else {
    body = (
      <>
        <p className="mb-5 text-slate-soft">
          {invitation.data.workshopName} has invited you to Wingstage. Choose a password to finish.
        </p>
        <AcceptInvitationForm token={token} invitation={invitation.data} onAccepted={(s) => void navigate(homeFor(s.user.role), { replace: true })} />
      </>
    );
  }

  return (
    <PublicFrame>
      <h1 className="mb-1 text-2xl font-bold">Accept your invitation</h1>
      {body}
    </PublicFrame>
  );
}
