import type { Appointment } from '@ostium/shared';
import { IconCircleCheckFilled, IconCircleDashed, IconMicroscope } from '@tabler/icons-react';
import { DifficultyBadge } from '../../../components/difficulty-badge';
import { PROCEDURE_LABELS } from '../../case-sheet/case-sheet.util';
import { blockTitle, localTime, STATE_LABELS, type BoardLookup } from '../board.util';

/** What a block shows: patient, tooth, procedure, level, microscope and its state, as words and icons. */
export function AppointmentBlock({ appointment: a, lookup, showChair = false }: { appointment: Appointment; lookup: BoardLookup; showChair?: boolean }) {
  const confirmedLike = a.state !== 'booked';
  return (
    <div className="ostium-block-body" data-state={a.state}>
      <div className="ostium-block-line">
        {confirmedLike ? <IconCircleCheckFilled size={13} aria-hidden="true" /> : <IconCircleDashed size={13} aria-hidden="true" />}
        <strong>{blockTitle(a, lookup.notation)}</strong>
      </div>
      <div className="ostium-block-line ostium-block-small">
        {localTime(a.start, lookup.timeZone)}–{localTime(a.end, lookup.timeZone)} · {PROCEDURE_LABELS[a.procedure]}
        {showChair && ` · ${lookup.chairs.get(a.chairId)?.name ?? ''}`}
      </div>
      <div className="ostium-block-line ostium-block-small">
        {a.level && <DifficultyBadge level={a.level} compact size="xs" />}
        {a.microscopeId !== null && <IconMicroscope size={14} aria-hidden="true" data-microscope="" />}
        <span className="ostium-block-state">{STATE_LABELS[a.state]}</span>
      </div>
    </div>
  );
}
