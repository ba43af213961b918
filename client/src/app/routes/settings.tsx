import { useSuspenseQuery } from '@tanstack/react-query';
import type { LoaderFunctionArgs } from 'react-router-dom';
import { PageHeader } from '@/components/ui/page';
import { workshopQueryOptions } from '@/features/workshop/api/get-workshop';
import { SettingsForm } from '@/features/workshop/components/settings-form';
import { queryClient } from '@/lib/query-client';
import { ADMIN, requireSession } from '../guards';

export async function loader({ request }: LoaderFunctionArgs) {
  await requireSession(request, ADMIN);
  await queryClient.ensureQueryData(workshopQueryOptions());
  return null;
}

export function Component() {
  const { data: workshop } = useSuspenseQuery(workshopQueryOptions());
  return (
    <>
      <PageHeader title="Settings" lead="The workshop's details as they appear on estimates and VAT invoices." />
      <div className="max-w-3xl">
        <SettingsForm workshop={workshop} />
      </div>
    </>
  );
}
