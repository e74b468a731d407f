// The audit report: its figures as JSON for the screen, and the PDF and CSV download addresses.
import { queryOptions } from '@tanstack/react-query';
import { auditReportSchema, type AuditReportQuery } from '@beadroll/rules';
import { apiRequest } from '@/lib/api-client';

const search = (q: AuditReportQuery) => new URLSearchParams({ from: q.from, to: q.to, ...(q.shopId ? { shopId: q.shopId } : {}) }).toString();

export const reportQueries = {
  all: () => ['reports'] as const,
  audit: (q: AuditReportQuery) =>
    queryOptions({
      queryKey: [...reportQueries.all(), 'audit', q] as const,
      queryFn: ({ signal }) => apiRequest(`/api/reports/audit?${search(q)}`, auditReportSchema, { signal }),
    }),
};

export const auditReportFile = (q: AuditReportQuery, ext: 'pdf' | 'csv') => `/api/reports/audit.${ext}?${search(q)}`;
