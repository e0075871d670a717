import type { QueryInterface } from 'sequelize';
import * as m0001 from './0001-workspaces-users-people';
import * as m0002 from './0002-accounts';
import * as m0003 from './0003-rosters';
import * as m0004 from './0004-billing';
import * as m0005 from './0005-staff-feeds';
import * as m0006 from './0006-run-contest';
import * as m0007 from './0007-absences-terms';
import * as m0008 from './0008-nothing-lost';
import * as m0010 from './0010-preferences';
import * as m0011 from './0011-swaps-offers-ledger';
import * as m0012 from './0012-sign-in-counters';
import * as m0013 from './0013-sign-up-requests';
import * as m0014 from './0014-exports';
import * as m0015 from './0015-run-roster';
import * as m0016 from './0016-run-dual';

export interface Migration {
  name: string;
  up(q: QueryInterface): Promise<void>;
  down(q: QueryInterface): Promise<void>;
}

/** In order; a migration once shipped is never edited, only followed by a new one. */
export const migrations: Migration[] = [
  { name: '0001-workspaces-users-people', ...m0001 },
  { name: '0002-accounts', ...m0002 },
  { name: '0003-rosters', ...m0003 },
  { name: '0004-billing', ...m0004 },
  { name: '0005-staff-feeds', ...m0005 },
  { name: '0006-run-contest', ...m0006 },
  { name: '0007-absences-terms', ...m0007 },
  { name: '0008-nothing-lost', ...m0008 },
  // kept last: migrations others add (0009…) go before it
  { name: '0010-preferences', ...m0010 },
  { name: '0011-swaps-offers-ledger', ...m0011 },
  { name: '0012-sign-in-counters', ...m0012 },
  { name: '0013-sign-up-requests', ...m0013 },
  { name: '0014-exports', ...m0014 },
  { name: '0015-run-roster', ...m0015 },
  { name: '0016-run-dual', ...m0016 },
];
