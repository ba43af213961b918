import { isTerminalJobState, type JobState } from '@wingstage/shared';
import { useQueries, useSuspenseQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { jobDocumentsQueryOptions } from '@/components/documents-section';
import { Caution } from '@/components/ui/notice';
import { myAircraftQueryOptions } from '@/features/owner/api/get-my-aircraft';
import { myJobsQueryOptions } from '@/features/owner/api/get-my-jobs';
import { myJobEstimateQueryOptions, myJobFindingsQueryOptions, myJobRequestsQueryOptions } from '@/features/owner/api/get-my-job-money';
import { myJobInvoiceQueryOptions } from '@/features/owner/api/get-my-invoice';
import { MyAircraftLetter, type JobMoney } from '@/features/owner/components/my-aircraft-letter';
import { OWNER_WORDS } from '@/features/owner/words';
import { OwnerDeposits } from '@/features/payments/components/owner-deposits';
import { queryClient } from '@/lib/query-client';
import { requireSession } from '../guards';
import { useCurrentSession } from '../use-current-session';

const INVOICED: readonly JobState[] = ['invoiced', 'paid', 'closed'];

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
  // Money and waiting decisions matter only while a job is open; they load after the letter shows.
  const open = jobs.items.filter((j) => !isTerminalJobState(j.state));
  const estimates = useQueries({ queries: open.map((j) => myJobEstimateQueryOptions(j.id)) });
  const requests = useQueries({ queries: open.map((j) => myJobRequestsQueryOptions(j.id)) });
  const findings = useQueries({ queries: open.map((j) => myJobFindingsQueryOptions(j.id)) });
  // Documents matter for every job, a closed one's invoice included.
  const documents = useQueries({ queries: jobs.items.map((j) => jobDocumentsQueryOptions(j.id)) });
  // Invoices: jobs invoiced, paid or closed (a closed job's invoice and credit notes stay to download).
  const invoiced = jobs.items.filter((j) => INVOICED.includes(j.state));
  const invoices = useQueries({ queries: invoiced.map((j) => myJobInvoiceQueryOptions(j.id)) });
  const money: Record<string, JobMoney> = Object.fromEntries(
    jobs.items.map((j, i) => [j.id, { documents: documents[i]?.data }]),
  );
  open.forEach((j, i) => Object.assign(money[j.id]!, { estimate: estimates[i]?.data, requests: requests[i]?.data, findings: findings[i]?.data }));
  invoiced.forEach((j, i) => {
    money[j.id] = { ...money[j.id], invoice: invoices[i]?.data };
  });
  return (
    <>
      <MyAircraftLetter firstName={firstName} workshopName={session.workshop.name} contact={session.workshop.contact} aircraft={aircraft.items} jobs={jobs.items} money={money} jobExtra={(jobId) => <OwnerDeposits jobId={jobId} />} />
      <div className="mx-auto max-w-2xl">
        <Caution>
          <span className="font-semibold">{OWNER_WORDS.cautionHeading}.</span> {OWNER_WORDS.caution}
        </Caution>
      </div>
    </>
  );
}
