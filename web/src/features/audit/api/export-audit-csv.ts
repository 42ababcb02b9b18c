import { useMutation } from '@tanstack/react-query';
import { apiBlob } from '../../../lib/api-client.ts';
import { auditQuery, type AuditFilters } from './get-audit.ts';

export function exportAuditCsv(filters: AuditFilters): Promise<Blob> {
  return apiBlob('/audit.csv', { query: auditQuery(filters), headers: { Accept: 'text/csv' } });
}

/** Fetches the CSV with the token and hands it to the browser as a download. */
export function useExportAuditCsv() {
  return useMutation({
    mutationFn: exportAuditCsv,
    onSuccess: (blob) => {
      const url = URL.createObjectURL(blob);
      const link = document.createElement('a');
      link.href = url;
      link.download = `weir-change-log-${new Date().toISOString().slice(0, 10)}.csv`;
      document.body.append(link);
      link.click();
      link.remove();
      setTimeout(() => URL.revokeObjectURL(url), 10_000);
    },
  });
}
