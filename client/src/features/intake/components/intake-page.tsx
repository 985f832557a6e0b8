import { Alert, Button, Card, Center, Group, Input, Kbd, Loader, SegmentedControl, Select, SimpleGrid, Stack, Text, Textarea, TextInput, Title } from '@mantine/core';
import { useForm } from '@mantine/form';
import { useHotkeys } from '@mantine/hooks';
import { notifications } from '@mantine/notifications';
import { PROCEDURES, URGENCIES, type Patient, type ReferringDentist } from '@ostium/shared';
import { useQueryClient } from '@tanstack/react-query';
import { useCallback, useEffect, useRef, useState, type ReactNode, type Ref } from 'react';
import { useNavigate } from 'react-router-dom';
import { PageHeader } from '../../../components/page-header';
import { ToothPicker } from '../../../components/tooth-picker';
import { ApiError } from '../../../lib/api-client';
import { patientKeys, patientsQuery } from '../../directory/api/patients';
import { referringDentistKeys } from '../../directory/api/referring-dentists';
import { useLocations, usePractice } from '../../practice/api/practice';
import { useCreateReferral } from '../../referrals/api/referrals';
import { PROCEDURE_LABELS, URGENCY_LABELS } from '../../referrals/referral-labels.util';
import { buildReferralRequest, formPathFor, initialIntakeValues, todayIn, validateIntake, type IntakeValues } from '../intake-form.util';
import { useAttachmentUploads } from '../use-attachment-uploads';
import { AttachmentsField } from './attachments-field';
import { PatientSection, type DuplicateState } from './patient-section';
import { ReferrerSection } from './referrer-section';

/** After a search is settled, the desk goes straight on to the next field instead of reaching for the mouse. */
function focusAfter(el: HTMLElement | null) {
  setTimeout(() => {
    if (!el) return;
    const all = [...document.querySelectorAll<HTMLElement>('form input:not([type=hidden]):not([disabled]), form button:not([disabled]), form textarea, form [tabindex="0"]')];
    all.find((x) => !el.contains(x) && el.compareDocumentPosition(x) & Node.DOCUMENT_POSITION_FOLLOWING)?.focus();
  }, 0);
}

function Section({ title, children, sectionRef }: { title: string; children: ReactNode; sectionRef?: Ref<HTMLElement> }) {
  return (
    <Card component="section" aria-label={title} padding="md" ref={sectionRef}>
      <Title order={3} fz="md" mb="sm">
        {title}
      </Title>
      {children}
    </Card>
  );
}

export function IntakePage() {
  const practice = usePractice();
  const locations = useLocations();
  if (practice.isError || locations.isError) {
    return (
      <Alert color="red" variant="light" title="Could not load the practice settings" role="alert">
        {((practice.error ?? locations.error) as Error).message}
      </Alert>
    );
  }
  if (!practice.data || !locations.data) {
    return (
      <Center py="xl">
        <Loader size="sm" aria-label="Loading" />
      </Center>
    );
  }
  return <IntakeForm notation={practice.data.settings.toothNotation} locations={locations.data.map((l) => ({ value: String(l.id), label: l.name, timeZone: l.timeZone }))} />;
}

function IntakeForm({ notation, locations }: { notation: 'fdi' | 'universal'; locations: { value: string; label: string; timeZone: string }[] }) {
  const navigate = useNavigate();
  const qc = useQueryClient();
  const create = useCreateReferral();
  const uploads = useAttachmentUploads();
  const [pickedPatient, setPickedPatient] = useState<Patient | null>(null);
  const [pickedDentist, setPickedDentist] = useState<ReferringDentist | null>(null);
  const [duplicate, setDuplicate] = useState<DuplicateState | null>(null);
  const [general, setGeneral] = useState<string[]>([]);
  const patientBox = useRef<HTMLElement>(null);
  const dentistBox = useRef<HTMLElement>(null);
  const form = useForm<IntakeValues>({
    initialValues: { ...initialIntakeValues(todayIn(locations[0]?.timeZone)), locationId: locations.length === 1 ? locations[0]!.value : null },
    validate: validateIntake,
  });

  // One location: nothing to choose. Several: the first is the usual one, but it is shown and changeable.
  useEffect(() => {
    if (!form.values.locationId && locations[0]) form.setFieldValue('locationId', locations[0].value);
  }, [locations]);

  /** After a 409 the records with the same name and birth date are looked up so the desk can pick one. */
  const showDuplicates = (v: IntakeValues, message: string) => {
    setDuplicate({ message, candidates: undefined });
    const same = (a: string, b: string) => a.trim().localeCompare(b.trim(), undefined, { sensitivity: 'base' }) === 0;
    qc.fetchQuery(patientsQuery({ q: v.patient.lastName.trim(), limit: 50 }))
      .then((found) => {
        const sameBirth = found.filter((p) => p.dateOfBirth === v.patient.dateOfBirth);
        const sameName = sameBirth.filter((p) => same(p.firstName, v.patient.firstName) && same(p.lastName, v.patient.lastName));
        setDuplicate({ message, candidates: sameName.length ? sameName : sameBirth });
      })
      .catch(() => setDuplicate({ message, candidates: [] }));
  };

  const save = (v: IntakeValues, confirmNew = false) => {
    setGeneral([]);
    const body = buildReferralRequest(v, notation, uploads.attachmentIds, confirmNew);
    create.mutate(body, {
      onSuccess: (r) => {
        if (body.patient) void qc.invalidateQueries({ queryKey: patientKeys.all });
        if (body.referringDentist) void qc.invalidateQueries({ queryKey: referringDentistKeys.all });
        notifications.show({
          color: 'lagoon',
          title: 'Referral saved',
          message: `${r.patient.name}: ${r.cases.length === 1 ? '1 case' : `${r.cases.length} cases`} in the queue.`,
        });
        navigate(`/referrals/${r.id}`);
      },
      onError: (e) => {
        if (e instanceof ApiError && e.status === 409 && body.patient) return showDuplicates(v, e.message);
        if (!(e instanceof ApiError) || e.errors.length === 0) return setGeneral([(e as Error).message]);
        const left: string[] = [];
        for (const f of e.errors) {
          const path = formPathFor(f.field);
          // Errors on a section that is folded away (e.g. new-patient fields while an existing one is chosen) go to the summary.
          const hidden = (path?.startsWith('patient.') && !v.newPatient) || (path?.startsWith('referringDentist.') && !v.newReferringDentist);
          if (path && !hidden) form.setFieldError(path, f.message);
          else left.push(f.message);
        }
        setGeneral(left);
      },
    });
  };

  const submit = form.onSubmit(
    (v) => save(v),
    () => setTimeout(() => document.querySelector<HTMLElement>('form [aria-invalid="true"]')?.focus(), 0),
  );
  // Also from inside a field: that is where the hand is when the form is done.
  useHotkeys([['mod+Enter', () => submit()]], []);

  // A stable handler keeps the (memoised) tooth chart from redrawing on every keystroke elsewhere.
  const setTeeth = useCallback((t: string[]) => form.setFieldValue('teeth', t), [form.setFieldValue]);
  const busy = create.isPending;
  const fieldErrors = Object.keys(form.errors).length;

  return (
    <>
      <PageHeader
        title="Intake"
        description={
          <>
            A new referral: who, from whom, which teeth and what came with it. <Kbd size="xs">Ctrl</Kbd> + <Kbd size="xs">Enter</Kbd> saves.
          </>
        }
      />
      <form onSubmit={submit} noValidate aria-label="New referral">
        <Stack gap="md" maw={1000}>
          <Section title="Patient" sectionRef={patientBox}>
            <PatientSection
              form={form}
              picked={pickedPatient}
              onPicked={(p) => {
                setPickedPatient(p);
                if (p) focusAfter(patientBox.current);
              }}
              duplicate={duplicate}
              busy={busy}
              onUseExisting={(p) => {
                const next = { ...form.values, patientId: p.id, newPatient: false };
                form.setValues({ patientId: p.id, newPatient: false });
                setPickedPatient(p);
                setDuplicate(null);
                save(next);
              }}
              onConfirmNew={() => {
                setDuplicate(null);
                save(form.values, true);
              }}
            />
          </Section>
          <Section title="Referring dentist" sectionRef={dentistBox}>
            <ReferrerSection
              form={form}
              picked={pickedDentist}
              onPicked={(d) => {
                setPickedDentist(d);
                if (d) focusAfter(dentistBox.current);
              }}
            />
          </Section>
          <Section title="Referral">
            <Stack gap="md">
              <SimpleGrid cols={{ base: 1, sm: 3 }} spacing="sm">
                <TextInput label="Received on" type="date" {...form.getInputProps('receivedOn')} />
                <Select label="Location" data={locations} allowDeselect={false} withAsterisk {...form.getInputProps('locationId')} />
                <Input.Wrapper label="Urgency" error={form.errors.urgency}>
                  <SegmentedControl
                    fullWidth
                    aria-label="Urgency"
                    color={form.values.urgency === 'urgent' ? 'red' : form.values.urgency === 'soon' ? 'amber' : 'lagoon'}
                    data={URGENCIES.map((u) => ({ value: u, label: URGENCY_LABELS[u] }))}
                    {...form.getInputProps('urgency')}
                  />
                </Input.Wrapper>
              </SimpleGrid>
              <Input.Wrapper label="Requested procedure" error={form.errors.procedure}>
                <SegmentedControl
                  fullWidth
                  aria-label="Requested procedure"
                  data={PROCEDURES.map((p) => ({ value: p, label: PROCEDURE_LABELS[p] }))}
                  {...form.getInputProps('procedure')}
                />
              </Input.Wrapper>
              <ToothPicker
                label="Teeth (each becomes a case)"
                notation={notation}
                value={form.values.teeth}
                onChange={setTeeth}
                error={form.errors.teeth}
              />
              <SimpleGrid cols={{ base: 1, sm: 2 }} spacing="sm">
                <Textarea
                  label="Referrer's reason"
                  placeholder="What the referring dentist asks for, e.g. lingering pain to cold"
                  rows={3}
                  {...form.getInputProps('reason')}
                />
                <Textarea label="Notes" placeholder="Anything the practice should know" rows={3} {...form.getInputProps('notes')} />
              </SimpleGrid>
            </Stack>
          </Section>
          <Section title="Radiographs and letters">
            <AttachmentsField uploads={uploads} error={form.errors.attachments as string | undefined} />
          </Section>
          {general.length > 0 && (
            <Alert color="red" variant="light" title="Not saved" role="alert">
              {general.map((m) => (
                <Text key={m} fz="sm">
                  {m}
                </Text>
              ))}
            </Alert>
          )}
          <Group justify="flex-end" gap="sm">
            {fieldErrors > 0 && (
              <Text fz="sm" c="red.8" mr="auto">
                {fieldErrors === 1 ? 'One field needs attention.' : `${fieldErrors} fields need attention.`}
              </Text>
            )}
            {uploads.uploading && (
              <Text fz="sm" c="dimmed">
                Waiting for uploads to finish…
              </Text>
            )}
            <Button type="submit" size="md" loading={busy} disabled={uploads.uploading}>
              Save referral
            </Button>
          </Group>
        </Stack>
      </form>
    </>
  );
}
