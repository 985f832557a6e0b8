import type { Appointment, AppointmentState, UpdateAppointmentRequest } from '@ostium/shared';
import { useCallback, useState } from 'react';
import { useUpdateAppointment } from './api/appointments';
import { changeRequest, problemFrom, type BoardLookup, type ChangeProblem } from './board.util';

/** One change from the board: a drag, a resize, a drop on another chair, or a state change from the drawer. */
export interface BoardChange {
  appointment: Appointment;
  start?: string;
  end?: string;
  chairId?: number;
  state?: AppointmentState;
  reason?: string;
  /** Puts the block back where it was (FullCalendar's revert); called when the server refuses. */
  revert?: () => void;
}

/**
 * Sends every board change through PATCH with the version it read. The server is the judge: on a 409
 * (taken or stale) the block goes back and the reason, with each conflict named, is kept for display.
 */
export function useBoardChange(lookup: BoardLookup) {
  const update = useUpdateAppointment();
  const [problem, setProblem] = useState<ChangeProblem | null>(null);

  const apply = useCallback(
    async (change: BoardChange): Promise<Appointment | null> => {
      setProblem(null);
      const body: UpdateAppointmentRequest = changeRequest(change.appointment, change, lookup);
      if (change.state) body.state = change.state;
      if (change.reason) body.reason = change.reason;
      if (Object.keys(body).length === 1) {
        // Dropped where it was: nothing to ask the server.
        change.revert?.();
        return change.appointment;
      }
      try {
        return await update.mutateAsync({ id: change.appointment.id, body });
      } catch (e) {
        change.revert?.();
        setProblem(problemFrom(e, lookup));
        return null;
      }
    },
    [lookup, update],
  );

  return { apply, problem, clearProblem: () => setProblem(null), pending: update.isPending };
}
