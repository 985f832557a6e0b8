import FullCalendar, { type EventClickInfo, type EventDropInfo, type EventLeaveInfo, type EventReceiveInfo, type EventResizeDoneInfo } from '@fullcalendar/react';
import interactionPlugin from '@fullcalendar/react/interaction';
import classicThemePlugin from '@fullcalendar/react/themes/classic';
import timeGridPlugin from '@fullcalendar/react/timegrid';
import '@fullcalendar/react/skeleton.css';
import '@fullcalendar/react/themes/classic/theme.css';
import type { Appointment, OpeningHours } from '@ostium/shared';
import { useMemo, type ReactNode } from 'react';
import { blockLabel, gridHours, toCalendarEvent, type BoardLookup } from '../board.util';
import type { BoardChange } from '../use-board-change';
import { AppointmentBlock } from './appointment-block';
import './board.css';

/** Reverts of blocks that left one chair column, waiting for the column they landed on to hear from the server. */
export type LeaveReverts = Map<string, () => void>;

export interface BoardCalendarProps {
  view: 'timeGridDay' | 'timeGridWeek';
  /** YYYY-MM-DD, local to the location. */
  date: string;
  appointments: Appointment[];
  lookup: BoardLookup;
  openingHours: OpeningHours;
  gridMinutes: number;
  /** The chair of this column (day view); a block dropped here moves to it. */
  chairId?: number;
  header?: ReactNode;
  leaveReverts?: LeaveReverts;
  onChange: (change: BoardChange) => void;
  onOpen: (a: Appointment) => void;
}

const appointmentOf = (e: { extendedProps: Record<string, unknown> }) => e.extendedProps.appointment as Appointment;
const iso = (d: Date | null) => (d ? d.toISOString() : undefined);
const hhmm = (m: number) => `${String(Math.floor(m / 60)).padStart(2, '0')}:${String(m % 60).padStart(2, '0')}`;

/** One FullCalendar time grid: a chair's column of the day, or the filtered week. */
export function BoardCalendar({ view, date, appointments, lookup, openingHours, gridMinutes, chairId, header, leaveReverts, onChange, onOpen }: BoardCalendarProps) {
  const events = useMemo(() => appointments.map(toCalendarEvent), [appointments]);
  const hours = gridHours(openingHours, date, view === 'timeGridWeek');
  const businessHours = useMemo(() => openingHours.map((h) => ({ daysOfWeek: [h.weekday % 7], startTime: h.open, endTime: h.close })), [openingHours]);

  const moved = (info: EventDropInfo | EventResizeDoneInfo) =>
    onChange({ appointment: appointmentOf(info.event), start: iso(info.event.start), end: iso(info.event.end), revert: info.revert });

  const received = (info: EventReceiveInfo) => {
    const leave = leaveReverts?.get(info.event.id);
    leaveReverts?.delete(info.event.id);
    const a = appointmentOf(info.event);
    const start = iso(info.event.start);
    const end = iso(info.event.end);
    // The board is drawn from the query: drop the copy FullCalendar made here, the server's answer redraws it.
    info.revert();
    onChange({ appointment: a, start, end, chairId, revert: leave });
  };

  return (
    <div className="ostium-board-calendar" data-chair={chairId}>
      <FullCalendar
        key={`${view}-${date}`}
        plugins={[timeGridPlugin, interactionPlugin, classicThemePlugin]}
        initialView={view}
        initialDate={date}
        timeZone={lookup.timeZone}
        headerToolbar={false}
        firstDay={1}
        allDaySlot={false}
        height="auto"
        slotMinTime={hours.min}
        slotMaxTime={hours.max}
        slotDuration="00:15"
        snapDuration={hhmm(gridMinutes)}
        slotHeaderInterval="01:00"
        eventTimeFormat={{ hour: '2-digit', minute: '2-digit', hour12: false }}
        slotHeaderFormat={{ hour: '2-digit', minute: '2-digit', hour12: false }}
        businessHours={businessHours}
        nowIndicator
        editable
        droppable={view === 'timeGridDay'}
        eventInteractive
        eventOverlap
        events={events}
        dayHeaderContent={header ? () => header : undefined}
        eventContent={(arg) => <AppointmentBlock appointment={appointmentOf(arg.event)} lookup={lookup} showChair={view === 'timeGridWeek'} />}
        eventDidMount={(arg) => {
          const a = appointmentOf(arg.event);
          arg.el.setAttribute('aria-label', blockLabel(a, lookup));
          arg.el.setAttribute('data-appointment', String(a.id));
        }}
        eventClick={(info: EventClickInfo) => {
          info.jsEvent.preventDefault();
          onOpen(appointmentOf(info.event));
        }}
        eventDrop={moved}
        eventResize={moved}
        eventLeave={(info: EventLeaveInfo) => leaveReverts?.set(info.event.id, info.revert)}
        eventReceive={received}
      />
    </div>
  );
}
