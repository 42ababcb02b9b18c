import type { Role } from '../auth/permissions.ts';

/** One demo account per role (two installers and two leads, so four-eyes can be shown). */
export const DEMO_ACCOUNTS: readonly { email: string; name: string; role: Role }[] = [
  { email: 'installer@example.test', name: 'Demo Installer', role: 'installer' },
  { email: 'installer2@example.test', name: 'Demo Installer Two', role: 'installer' },
  { email: 'lead@example.test', name: 'Demo Lead', role: 'lead' },
  { email: 'lead2@example.test', name: 'Demo Lead Two', role: 'lead' },
  { email: 'auditor@example.test', name: 'Demo Auditor', role: 'auditor' },
  { email: 'admin@example.test', name: 'Demo Admin', role: 'admin' },
];
