import type { Role } from '../../../types/api.ts';

export const ROLE_LABEL: Record<Role, string> = { installer: 'Installer', lead: 'Lead engineer', auditor: 'Auditor', admin: 'Admin' };
