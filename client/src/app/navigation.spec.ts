import { ACCESS, ROLES } from '@ostium/shared';
import { describe, expect, it } from 'vitest';
import { NAV_ITEMS, navFor } from './navigation';

describe('navFor', () => {
  it('gives administration pages to the admin only', () => {
    expect(navFor('admin').map((i) => i.label)).toEqual(expect.arrayContaining(['Users and roles', 'Audit log']));
    for (const role of ROLES.filter((r) => r !== 'admin')) {
      expect(navFor(role).map((i) => i.label)).not.toContain('Users and roles');
    }
  });

  it('shows Replies to the front desk and admin, and Reminders (with the settings) to admin and manager', () => {
    const who = (label: string) => ROLES.filter((r) => navFor(r).some((i) => i.label === label));
    expect(who('Replies')).toEqual(['admin', 'frontdesk']);
    expect(who('Reminders')).toEqual(['admin', 'manager']);
    expect(NAV_ITEMS.find((i) => i.label === 'Reminders')).toMatchObject({ to: '/settings/reminders', section: 'admin' });
    expect(NAV_ITEMS.find((i) => i.label === 'Replies')).toMatchObject({ to: '/replies', section: 'work' });
  });

  it('shows each item exactly to the roles the server allows', () => {
    for (const item of NAV_ITEMS.filter((i) => i.capability)) {
      for (const role of ROLES) {
        const allowed = (ACCESS[item.capability!] as readonly string[]).includes(role);
        expect(navFor(role).includes(item), `${item.label} for ${role}`).toBe(allowed);
      }
    }
  });
});
