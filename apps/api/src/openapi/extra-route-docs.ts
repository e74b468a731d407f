// Routes of the import, report and export features (issue 13), listed beside the core table.
import {
  importCheckInput,
  importListSchema,
  importSchema,
  importUploadFields,
  paperRecordListQuery,
  paperRecordListSchema,
  paperRecordSchema,
  paperSettleInput,
  auditReportQuery,
  auditReportSchema,
} from '@beadroll/rules';
import type { RouteDoc } from './route-docs.js';

const qa = ['qa_manager'];

export const extraRouteDocs: RouteDoc[] = [
  { method: 'get', path: '/imports', summary: 'Recent imports', tag: 'Imports', access: 'session', roles: qa, status: 200, response: importListSchema },
  { method: 'post', path: '/imports', summary: 'Upload a .csv or .xlsx file to import (nothing is written yet)', tag: 'Imports', access: 'session', roles: qa, multipart: importUploadFields, status: 201, response: importSchema },
  { method: 'get', path: '/imports/:id', summary: 'An import: mapping, dry-run report, progress', tag: 'Imports', access: 'session', roles: qa, status: 200, response: importSchema },
  { method: 'post', path: '/imports/:id/check', summary: 'Dry run with a column mapping and date format', tag: 'Imports', access: 'session', roles: qa, body: importCheckInput, status: 200, response: importSchema },
  { method: 'post', path: '/imports/:id/commit', summary: 'Commit a checked import (all or nothing); poll for progress', tag: 'Imports', access: 'session', roles: qa, status: 202, response: importSchema },
  { method: 'post', path: '/imports/:id/cancel', summary: 'Cancel a running import (nothing is written)', tag: 'Imports', access: 'session', roles: qa, status: 200, response: importSchema },
  { method: 'get', path: '/paper-records', summary: 'Imported paper WPQs whose stated ranges differ from the computed ones', tag: 'Imports', access: 'session', roles: qa, query: paperRecordListQuery, status: 200, response: paperRecordListSchema },
  { method: 'post', path: '/paper-records/:id/settle', summary: 'Settle a paper WPQ’s range difference: the computed ranges stand, or narrow to what both allow', tag: 'Imports', access: 'session', roles: qa, body: paperSettleInput, status: 200, response: paperRecordSchema },
  { method: 'get', path: '/reports/audit', summary: 'Audit report for a shop or the company and a period', tag: 'Reports', access: 'any', roles: qa, query: auditReportQuery, status: 200, response: auditReportSchema },
  { method: 'get', path: '/reports/audit.pdf', summary: 'The audit report as a PDF', tag: 'Reports', access: 'any', roles: qa, query: auditReportQuery, status: 200, response: { binary: 'application/pdf' } },
  { method: 'get', path: '/reports/audit.csv', summary: 'The audit report as a CSV (one row per fact, section first)', tag: 'Reports', access: 'any', roles: qa, query: auditReportQuery, status: 200, response: { binary: 'text/csv' } },
];

