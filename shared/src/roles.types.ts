export const ROLES = ['admin', 'manager', 'endodontist', 'assistant', 'frontdesk'] as const;
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  admin: 'Administrator',
  manager: 'Practice manager',
  endodontist: 'Endodontist',
  assistant: 'Assistant',
  frontdesk: 'Front desk',
};

/**
 * Who may do what, read by the server's @Roles() guards and by the client's navigation,
 * so the two can never disagree.
 */
export const ACCESS = {
  users: ['admin'],
  audit: ['admin'],
  settings: ['admin'],
  referralsRead: ['frontdesk', 'endodontist', 'manager', 'admin'],
  referralsWrite: ['frontdesk', 'admin'],
  cases: ['endodontist', 'frontdesk', 'manager', 'admin'],
  casesAdjust: ['endodontist'],
  estimates: ['endodontist', 'frontdesk', 'manager', 'admin'],
  estimateAccuracy: ['manager', 'admin', 'endodontist'],
  visitHistoryImport: ['admin', 'manager'],
  schedule: ['frontdesk', 'endodontist', 'manager', 'admin'],
  chairside: ['assistant', 'endodontist', 'frontdesk', 'admin'],
  // Operators manage their own calendar feed; an administrator anyone's.
  feeds: ['endodontist', 'admin'],
  replies: ['frontdesk', 'admin'],
  // Reminder rules, templates, quiet hours and caps.
  reminderSettings: ['admin', 'manager'],
  // Writing the findings and sending the completion report to the referring dentist.
  completionReport: ['endodontist'],
  reports: ['manager', 'admin'],
} as const satisfies Record<string, readonly Role[]>;
export type Capability = keyof typeof ACCESS;

export function can(role: Role | undefined | null, capability: Capability): boolean {
  return !!role && (ACCESS[capability] as readonly Role[]).includes(role);
}
