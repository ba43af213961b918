import { zodResolver } from '@hookform/resolvers/zod';
import { TEXT_MAX, aircraftCreateSchema, type AircraftCreate, type AircraftDto } from '@wingstage/shared';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { Button } from '@/components/ui/button';
import { ButtonLink } from '@/components/ui/button-link';
import { TextAreaField, TextField } from '@/components/ui/field';
import { PickerField } from '@/components/ui/picker-field';
import type { PickerSource } from '@/components/ui/search-picker';
import { FormErrorSummary } from '@/components/ui/notice';
import { withServerErrors } from '@/lib/form-errors';

export const AIRCRAFT_LABELS = {
  customerId: 'Owner',
  registration: 'Registration',
  type: 'Type',
  serial: 'Serial number',
  airframeHours: 'Airframe hours',
  engine: 'Engine',
  engineHours: 'Engine hours',
  notes: 'Notes',
};

export function AircraftForm<O>({
  initial,
  owners,
  defaultOwnerId,
  submitLabel,
  cancelTo,
  onSubmit,
}: {
  initial?: AircraftDto;
  /** Searches the workshop's owners on the server; the value's label is looked up by id. */
  owners: PickerSource<O>;
  defaultOwnerId?: string;
  submitLabel: string;
  cancelTo: string;
  onSubmit: (values: AircraftCreate) => Promise<unknown>;
}) {
  const [summary, setSummary] = useState<string | null>(null);
  const { register, control, handleSubmit, setError, formState } = useForm<z.input<typeof aircraftCreateSchema>, unknown, z.output<typeof aircraftCreateSchema>>({
    resolver: zodResolver(aircraftCreateSchema),
    defaultValues: {
      customerId: initial?.customerId ?? defaultOwnerId ?? '',
      registration: initial?.registration ?? '',
      type: initial?.type ?? '',
      serial: initial?.serial ?? '',
      airframeHours: initial?.airframeHours ?? '0',
      engine: initial?.engine ?? '',
      engineHours: initial?.engineHours ?? '0',
      notes: initial?.notes ?? '',
    },
  });
  const e = formState.errors;

  const submit = handleSubmit(withServerErrors(setError, setSummary, Object.keys(AIRCRAFT_LABELS), onSubmit));

  return (
    <form onSubmit={submit} noValidate className="flex max-w-2xl flex-col gap-4">
      <FormErrorSummary message={summary} errors={e} labels={AIRCRAFT_LABELS} />
      <PickerField control={control} name="customerId" label={AIRCRAFT_LABELS.customerId} required source={owners} placeholder="Type the owner's name" error="Choose the owner." />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={AIRCRAFT_LABELS.registration} required autoCapitalize="characters" autoComplete="off" hint="For example Q-BRKA." error={e.registration?.message} {...register('registration')} />
        <TextField label={AIRCRAFT_LABELS.serial} autoComplete="off" error={e.serial?.message} {...register('serial')} />
      </div>
      <TextField label={AIRCRAFT_LABELS.type} required autoComplete="off" hint="As the workshop describes it, e.g. three-axis high-wing microlight." error={e.type?.message} {...register('type')} />
      <TextField label={AIRCRAFT_LABELS.engine} autoComplete="off" error={e.engine?.message} {...register('engine')} />
      <div className="grid gap-4 sm:grid-cols-2">
        <TextField label={AIRCRAFT_LABELS.airframeHours} inputMode="decimal" autoComplete="off" error={e.airframeHours?.message} {...register('airframeHours')} />
        <TextField label={AIRCRAFT_LABELS.engineHours} inputMode="decimal" autoComplete="off" error={e.engineHours?.message} {...register('engineHours')} />
      </div>
      <TextAreaField label={AIRCRAFT_LABELS.notes} rows={3} maxChars={TEXT_MAX.notes} error={e.notes?.message} {...register('notes')} />
      <div className="flex flex-wrap gap-2">
        <Button type="submit" busy={formState.isSubmitting}>
          {submitLabel}
        </Button>
        <ButtonLink to={cancelTo} variant="secondary">
          Cancel
        </ButtonLink>
      </div>
    </form>
  );
}
