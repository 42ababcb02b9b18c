import { queryOptions, useQuery } from '@tanstack/react-query';
import { api } from '../../../lib/api-client.ts';
import type { AuditVerify } from '../../../types/api.ts';

export function getAuditVerify(): Promise<AuditVerify> {
  return api<AuditVerify>('/audit/verify');
}

export const auditVerifyQueryOptions = () => queryOptions({ queryKey: ['audit', 'verify'], queryFn: getAuditVerify });

export function useAuditVerify() {
  return useQuery(auditVerifyQueryOptions());
}
