import type { QueryInterface } from 'sequelize';
import * as m0001 from './20261201-0001-foundation.js';
import * as m0002 from './20261201-0002-referrals.js';
import * as m0003 from './20261201-0003-estimates.js';
import * as m0004 from './20261201-0004-scheduling.js';
import * as m0005 from './20261202-0005-messaging.js';
import * as m0006 from './20261202-0006-letters.js';
import * as m0007 from './20261202-0007-reports.js';

export interface Migration {
  name: string;
  up: (q: QueryInterface) => Promise<void>;
  down: (q: QueryInterface) => Promise<void>;
}

// In order; a new migration is a new timestamped file added at the end of this list.
export const MIGRATIONS: Migration[] = [
  { name: '20261201-0001-foundation', ...m0001 },
  { name: '20261201-0002-referrals', ...m0002 },
  { name: '20261201-0003-estimates', ...m0003 },
  { name: '20261201-0004-scheduling', ...m0004 },
  { name: '20261202-0005-messaging', ...m0005 },
  { name: '20261202-0006-letters', ...m0006 },
  { name: '20261202-0007-reports', ...m0007 },
];
