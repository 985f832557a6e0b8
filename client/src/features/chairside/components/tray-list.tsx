import type { TrayItem } from '@ostium/shared';
import { ISO_SWATCH } from '../../case-sheet/case-sheet.util';

const size2 = (n: number) => String(n).padStart(2, '0');
const taperText = (t: number) => `.${String(Math.round(t * 100)).padStart(2, '0')}`;

/** The tray to prepare: each file with its ISO 3630-1 size, colour swatch and taper; other items as plain lines. */
export function TrayList({ items, label }: { items: TrayItem[]; label: string }) {
  if (items.length === 0) return <p className="chairside-tray-empty">No tray list for this visit.</p>;
  return (
    <ul className="chairside-tray" aria-label={label}>
      {items.map((t, i) => (
        <li key={i} className="chairside-tray-item">
          <span className="chairside-check" aria-hidden="true" />
          {t.size !== undefined ? (
            <span className="chairside-size">
              <span
                className="chairside-swatch"
                data-colour={t.colour}
                aria-hidden="true"
                style={{ background: t.colour ? (ISO_SWATCH[t.colour] ?? 'transparent') : 'transparent' }}
              />
              <b>{size2(t.size)}</b>
              {t.taper !== undefined && <span className="chairside-taper">{taperText(t.taper)}</span>}
            </span>
          ) : (
            <span className="chairside-size" />
          )}
          <span>
            {t.label}
            {t.colour && <span className="chairside-colour-name"> ({t.colour})</span>}
          </span>
        </li>
      ))}
    </ul>
  );
}
