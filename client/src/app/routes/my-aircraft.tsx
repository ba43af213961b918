import { useSuspenseQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { Caution } from '@/components/ui/notice';
import { myAircraftQueryOptions } from '@/features/owner/api/get-my-aircraft';
import { myJobsQueryOptions } from '@/features/owner/api/get-my-jobs';
import { MyAircraftLetter } from '@/features/owner/components/my-aircraft-letter';
import { queryClient } from '@/lib/query-client';
import { requireSession } from '../guards';
import { useCurrentSession } from '../use-current-session';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, ['owner']);
  await Promise.all([queryClient.ensureQueryData(myAircraftQueryOptions()), queryClient.ensureQueryData(myJobsQueryOptions())]);
  return null;
}

export function Component() {
  const session = useCurrentSession();
  const { data: aircraft } = useSuspenseQuery(myAircraftQueryOptions());
  const { data: jobs } = useSuspenseQuery(myJobsQueryOptions());
  const firstName = session.user.name.split(/\s+/)[0] ?? session.user.name;
  return (
    <>
      <MyAircraftLetter firstName={firstName} workshopName={session.workshop.name} aircraft={aircraft.items} jobs={jobs.items} />
      <div className="mx-auto max-w-2xl">
        <Caution />
      </div>
    </>
  );
}
