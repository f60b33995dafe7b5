import path from 'node:path';

export const DEMO_PASSWORD = 'reelwright-demo';

/** The demo accounts, the heading each lands on, and where its signed-in state is saved. */
export const ACCOUNTS = {
  owner: { email: 'owner@saltwick.test', landing: 'The network today' },
  managerNorth: { email: 'manager.north@saltwick.test', landing: 'North Shore today' },
  managerSouth: { email: 'manager.south@saltwick.test', landing: 'South Shore today' },
  leadMarram: { email: 'lead.marram@saltwick.test', landing: 'Marram Point today' },
  techMarram: { email: 'tech.marram@saltwick.test', landing: 'Your bench' },
  leadFennel: { email: 'lead.fennel@saltwick.test', landing: 'Fennel Cove today' },
  techFennel: { email: 'tech.fennel@saltwick.test', landing: 'Your bench' },
  auditor: { email: 'auditor@saltwick.test', landing: 'Shops to audit' },
} as const;

export type AccountName = keyof typeof ACCOUNTS;

export const storageState = (name: AccountName) =>
  path.join(import.meta.dirname, '..', '.auth', `${name}.json`);

export const screenshotPath = (name: string) =>
  path.join(import.meta.dirname, '..', 'screenshots', `${name}.png`);
