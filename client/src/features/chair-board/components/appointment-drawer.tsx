import { Anchor, Badge, Button, Divider, Drawer, Group, NumberInput, Select, Stack, Table, Text, Textarea, TextInput } from '@mantine/core';
import { confirmedViaLabel, formatTooth, type Appointment, type AppointmentState, type ChairSummary } from '@ostium/shared';
import { IconMicroscope } from '@tabler/icons-react';
import { DateTime } from 'luxon';
import { useEffect, useState } from 'react';
import { Link } from 'react-router-dom';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { ACTION_LABELS, isMovable, localDate, localDay, localTime, minutesBetween, NEXT_STATES, STATE_LABELS, type BoardLookup, type ChangeProblem } from '../board.util';
import type { BoardChange } from '../use-board-change';
import { ChangeProblemAlert } from './change-problem-alert';

export interface AppointmentDrawerProps {
  appointment: Appointment | null;
  lookup: BoardLookup;
  /** Chairs of the appointment's location, for "move to chair". */
  chairs: ChairSummary[];
  gridMinutes: number;
  problem: ChangeProblem | null;
  pending: boolean;
  onApply: (change: BoardChange) => Promise<Appointment | null>;
  onClose: () => void;
}

/** Details of one visit with its state changes, and a keyboard way to move it (also to another chair). */
export function AppointmentDrawer({ appointment: a, lookup, chairs, gridMinutes, problem, pending, onApply, onClose }: AppointmentDrawerProps) {
  return (
    <Drawer opened={a !== null} onClose={onClose} position="right" size="md" title={a?.patient.name}
      styles={{ title: { fontWeight: 700, fontSize: 'var(--mantine-font-size-lg)' } }}>
      {a && <DrawerBody key={`${a.id}-${a.version}`} a={a} lookup={lookup} chairs={chairs} gridMinutes={gridMinutes} problem={problem} pending={pending} onApply={onApply} />}
    </Drawer>
  );
}

function DrawerBody({ a, lookup, chairs, gridMinutes, problem, pending, onApply }: Omit<AppointmentDrawerProps, 'appointment' | 'onClose'> & { a: Appointment }) {
  const zone = lookup.timeZone;
  const [cancelling, setCancelling] = useState(false);
  const [reason, setReason] = useState('');
  const [chairId, setChairId] = useState(String(a.chairId));
  const [day, setDay] = useState(localDate(a.start, zone));
  const [time, setTime] = useState(localTime(a.start, zone));
  const [minutes, setMinutes] = useState<number | string>(minutesBetween(a.start, a.end));
  useEffect(() => setCancelling(false), [a.state]);

  const tooth = (() => {
    try {
      return formatTooth(a.toothFdi, lookup.notation);
    } catch {
      return a.toothFdi;
    }
  })();
  const microscope = a.microscopeId !== null ? (lookup.microscopes.get(a.microscopeId)?.name ?? `#${a.microscopeId}`) : null;
  const rows: [string, React.ReactNode][] = [
    ['When', `${localDay(a.start, zone)}, ${localTime(a.start, zone)}–${localTime(a.end, zone)} (${minutesBetween(a.start, a.end)} min)`],
    ['Tooth', tooth],
    ['Procedure', PROCEDURE_LABELS[a.procedure]],
    ['Visit', String(a.visitIndex + 1)],
    ['Chair', lookup.chairs.get(a.chairId)?.name ?? `#${a.chairId}`],
    ['Endodontist', lookup.operators.get(a.operatorId) ?? `#${a.operatorId}`],
    ['Microscope', microscope ?? 'None'],
    ['Turnover after', `${a.turnoverMinutes} min`],
  ];
  if (a.confirmedAt) rows.push(['Confirmed', `${DateTime.fromISO(a.confirmedAt, { zone }).toFormat('d LLL, HH:mm')}${a.confirmedVia ? ` by ${confirmedViaLabel(a.confirmedVia)}` : ''}`]);
  if (a.seatedAt) rows.push(['Seated', localTime(a.seatedAt, zone)]);
  if (a.dismissedAt) rows.push(['Dismissed', localTime(a.dismissedAt, zone)]);
  if (a.cancellation) rows.push(['Cancelled', `${a.cancellation.reason} (${a.cancellation.noticeHours} h notice${a.cancellation.byName ? `, ${a.cancellation.byName}` : ''})`]);
  if (a.notes) rows.push(['Notes', a.notes]);

  const setState = (state: AppointmentState, why?: string) => void onApply({ appointment: a, state, reason: why });

  const move = () => {
    const start = DateTime.fromISO(`${day}T${time}`, { zone });
    if (!start.isValid || typeof minutes !== 'number') return;
    void onApply({ appointment: a, chairId: Number(chairId), start: start.toUTC().toISO()!, end: start.plus({ minutes }).toUTC().toISO()! });
  };

  return (
    <Stack gap="md">
      <Group gap="xs">
        <Badge color={a.state === 'booked' ? 'stone' : 'lagoon'} variant={a.state === 'booked' ? 'outline' : 'filled'}>
          {STATE_LABELS[a.state]}
        </Badge>
        {a.level && <DifficultyBadge level={a.level} />}
        {microscope && (
          <Badge color="lagoon" variant="light" leftSection={<IconMicroscope size={12} />}>
            Microscope
          </Badge>
        )}
      </Group>
      <Table aria-label="Visit details" withRowBorders={false} verticalSpacing={2}>
        <Table.Tbody>
          {rows.map(([k, v]) => (
            <Table.Tr key={k}>
              <Table.Th w={120} fw={500} c="dimmed">
                {k}
              </Table.Th>
              <Table.Td>{v}</Table.Td>
            </Table.Tr>
          ))}
        </Table.Tbody>
      </Table>
      <Anchor component={Link} to={`/cases/${a.caseId}`} fz="sm">
        Open the case sheet
      </Anchor>

      <ChangeProblemAlert problem={problem} />

      {NEXT_STATES[a.state].length > 0 && (
        <div>
          <Text fw={600} fz="sm" mb={6}>
            Change state
          </Text>
          <Group gap="xs">
            {NEXT_STATES[a.state]
              .filter((s) => s !== 'cancelled')
              .map((s) => (
                <Button key={s} size="xs" variant={s === 'no_show' ? 'default' : 'light'} loading={pending} onClick={() => setState(s)}>
                  {ACTION_LABELS[s]}
                </Button>
              ))}
            {NEXT_STATES[a.state].includes('cancelled') && !cancelling && (
              <Button size="xs" color="plum" variant="subtle" onClick={() => setCancelling(true)}>
                Cancel visit…
              </Button>
            )}
          </Group>
          {cancelling && (
            <Stack gap="xs" mt="xs">
              <Textarea label="Reason for cancelling" required rows={2} value={reason} onChange={(e) => setReason(e.currentTarget.value)} />
              <Group gap="xs">
                <Button size="xs" color="plum" disabled={!reason.trim()} loading={pending} onClick={() => setState('cancelled', reason.trim())}>
                  Cancel this visit
                </Button>
                <Button size="xs" variant="default" onClick={() => setCancelling(false)}>
                  Keep it
                </Button>
              </Group>
            </Stack>
          )}
        </div>
      )}

      {isMovable(a) && (
        <>
          <Divider />
          <Stack gap="xs" component="form" aria-label="Move or resize" onSubmit={(e) => (e.preventDefault(), move())}>
            <Text fw={600} fz="sm">
              Move or resize
            </Text>
            <Select label="Chair" data={chairs.map((c) => ({ value: String(c.id), label: c.name }))} value={chairId} onChange={(v) => v && setChairId(v)} allowDeselect={false} />
            <Group grow gap="xs">
              <TextInput type="date" label="Date" value={day} onChange={(e) => setDay(e.currentTarget.value)} />
              <TextInput type="time" label="Start" step={gridMinutes * 60} value={time} onChange={(e) => setTime(e.currentTarget.value)} />
              <NumberInput label="Minutes" min={gridMinutes} step={gridMinutes} value={minutes} onChange={setMinutes} />
            </Group>
            <Group>
              <Button type="submit" size="xs" loading={pending}>
                Move visit
              </Button>
            </Group>
          </Stack>
        </>
      )}
    </Stack>
  );
}
