// Every route of /api with the zod schemas its handler parses and answers with — the same schema objects
// from @beadroll/rules the routers use, so the OpenAPI description cannot drift from the code. A route
// added to a router and not listed here fails tests/integration/openapi (it enumerates the router).
import { z } from 'zod';
import {
  apiTokenCreatedSchema,
  apiTokenInput,
  apiTokenListSchema,
  apiTokenSchema,
  auditEventSchema,
  auditListQuery,
  certifyInput,
  companySettingsInput,
  companySettingsSchema,
  couponListQuery,
  couponRecordInput,
  couponRecordSchema,
  couponUpdateInput,
  gridQuery,
  gridSaveInput,
  gridSchema,
  gridWelderListSchema,
  gridWeldersQuery,
  lapseNoticeListSchema,
  lapseWatchNoticesQuery,
  lapseWatchPreviewQuery,
  lapseWatchPreviewSchema,
  lapseWatchRunInput,
  lapseWatchRunListSchema,
  lapseWatchRunSchema,
  loginInput,
  meSchema,
  overviewSchema,
  pageOf,
  passwordResetRequestInput,
  personInput,
  personSchema,
  personUpdateInput,
  procedureInput,
  procedureListQuery,
  procedureSchema,
  procedureUpdateInput,
  qualificationListQuery,
  crewFinderAnswerSchema,
  crewFinderQueryFields,
  qualifiedOnAnswerSchema,
  qualifiedOnQueryFields,
  qualificationSchema,
  reviewInput,
  reviewDecisions,
  reviewQueueSchema,
  revokeInput,
  sessionListSchema,
  setPasswordInput,
  shopInput,
  shopSchema,
  shopUpdateInput,
  timelineSchema,
  tokenInfoSchema,
  uploadSchema,
  verifySchema,
  verifyTokenIssuedSchema,
  verifyTokenStatusSchema,
  welderInput,
  welderListQuery,
  welderPageSchema,
  welderSchema,
  welderUpdateInput,
  weldDetailSchema,
  weldDispositionInput,
  weldInput,
  weldListQuery,
  weldPageSchema,
  weldSchema,
  jobSummaryQuery,
  weldWelderListSchema,
  weldWelderQuery,
} from '@beadroll/rules';
import { extraRouteDocs } from './extra-route-docs.js';

export type Method = 'get' | 'post' | 'put' | 'patch' | 'delete';

/** Who may call a route: `public` needs nothing; `session` only a signed-in person; `any` a person or an API token. */
export type Access = 'public' | 'session' | 'any';

export interface RouteDoc {
  method: Method;
  /** Express path under /api, with :params. */
  path: string;
  summary: string;
  tag: string;
  access: Access;
  /** Roles that may call it (absent: every signed-in role). */
  roles?: string[];
  query?: z.ZodObject;
  body?: z.ZodType;
  /** A multipart upload: the form fields besides the file. */
  multipart?: z.ZodObject;
  /** The success status and its JSON schema, or a binary type (PDF, file) with no JSON schema. */
  status: number;
  response: z.ZodType | { binary: string } | null;
}

const items = <T extends z.ZodType>(item: T) => z.object({ items: z.array(item) });
const status = (s: string) => z.object({ status: z.literal(s) });
const qa = ['qa_manager'];
const managers = ['qa_manager', 'foreman'];

const mailSummary = z.object({
  id: z.string(),
  date: z.string(),
  from: z.string(),
  to: z.string(),
  subject: z.string(),
});

export const coreRouteDocs: RouteDoc[] = [
  // health and sign-in
  { method: 'get', path: '/health', summary: 'Whether the API and its database answer', tag: 'Health', access: 'public', status: 200, response: z.object({ status: z.enum(['ok', 'degraded']), db: z.enum(['ok', 'down']) }) },
  { method: 'post', path: '/auth/login', summary: 'Sign in (sets the session cookie)', tag: 'Sign-in', access: 'public', body: loginInput, status: 200, response: meSchema },
  { method: 'post', path: '/auth/logout', summary: 'Sign out (clears the session cookie)', tag: 'Sign-in', access: 'public', status: 204, response: null },
  { method: 'get', path: '/me', summary: 'The caller', tag: 'Sign-in', access: 'any', status: 200, response: meSchema },
  { method: 'get', path: '/auth/session', summary: 'Who is signed in, or nobody (never 401)', tag: 'Sign-in', access: 'public', status: 200, response: z.object({ me: meSchema.nullable() }) },
  { method: 'post', path: '/auth/password-reset', summary: 'Ask for a password-reset e-mail', tag: 'Sign-in', access: 'public', body: passwordResetRequestInput, status: 202, response: status('accepted') },
  { method: 'get', path: '/auth/tokens/:token', summary: 'What an invitation or reset link is for', tag: 'Sign-in', access: 'public', status: 200, response: tokenInfoSchema },
  { method: 'get', path: '/auth/sessions', summary: 'The caller’s signed-in browsers and devices', tag: 'Sign-in', access: 'session', status: 200, response: sessionListSchema },
  { method: 'post', path: '/auth/sessions/end-others', summary: 'Sign out every other browser and device of the caller', tag: 'Sign-in', access: 'session', status: 200, response: z.object({ ended: z.number().int() }) },
  { method: 'delete', path: '/auth/sessions/:id', summary: 'Sign out one of the caller’s browsers or devices', tag: 'Sign-in', access: 'session', status: 204, response: null },
  { method: 'post', path: '/auth/set-password', summary: 'Set a password from an invitation or reset link', tag: 'Sign-in', access: 'public', body: setPasswordInput, status: 200, response: meSchema },

  // shops, people, welders
  { method: 'get', path: '/shops', summary: 'Shops the caller may see', tag: 'Shops', access: 'any', status: 200, response: items(shopSchema) },
  { method: 'get', path: '/shops/:id', summary: 'One shop', tag: 'Shops', access: 'any', status: 200, response: shopSchema },
  { method: 'post', path: '/shops', summary: 'Add a shop', tag: 'Shops', access: 'any', roles: qa, body: shopInput, status: 201, response: shopSchema },
  { method: 'patch', path: '/shops/:id', summary: 'Change a shop', tag: 'Shops', access: 'any', roles: qa, body: shopUpdateInput, status: 200, response: shopSchema },
  { method: 'get', path: '/people', summary: 'People with a sign-in', tag: 'People', access: 'session', roles: qa, status: 200, response: items(personSchema) },
  { method: 'get', path: '/people/:id', summary: 'One person', tag: 'People', access: 'session', roles: qa, status: 200, response: personSchema },
  { method: 'post', path: '/people', summary: 'Invite a person', tag: 'People', access: 'session', roles: qa, body: personInput, status: 201, response: personSchema },
  { method: 'patch', path: '/people/:id', summary: 'Change a person', tag: 'People', access: 'session', roles: qa, body: personUpdateInput, status: 200, response: personSchema },
  { method: 'post', path: '/people/:id/invitation', summary: 'Send the invitation again', tag: 'People', access: 'session', roles: qa, status: 202, response: status('sent') },
  { method: 'get', path: '/welders', summary: 'Welders, paged, with their qualifications’ state today', tag: 'Welders', access: 'any', query: welderListQuery, status: 200, response: welderPageSchema },
  { method: 'get', path: '/welders/:id', summary: 'The welder file', tag: 'Welders', access: 'any', status: 200, response: welderSchema },
  { method: 'post', path: '/welders', summary: 'Add a welder', tag: 'Welders', access: 'any', roles: qa, body: welderInput, status: 201, response: welderSchema },
  { method: 'patch', path: '/welders/:id', summary: 'Change a welder (optimistic lock on version)', tag: 'Welders', access: 'any', roles: qa, body: welderUpdateInput, status: 200, response: welderSchema },
  { method: 'post', path: '/welders/:id/account', summary: 'Give a welder a sign-in', tag: 'Welders', access: 'any', roles: qa, status: 201, response: personSchema },
  { method: 'get', path: '/welders/:id/card.pdf', summary: 'The welder’s wallet card', tag: 'Welders', access: 'any', status: 200, response: { binary: 'application/pdf' } },
  { method: 'get', path: '/welders/:id/verify-token', summary: 'Whether the welder’s verify link is active', tag: 'Verify', access: 'any', roles: qa, status: 200, response: verifyTokenStatusSchema },
  { method: 'post', path: '/welders/:id/verify-token', summary: 'Issue a new verify link (the old one stops working)', tag: 'Verify', access: 'any', roles: qa, status: 201, response: verifyTokenIssuedSchema },
  { method: 'delete', path: '/welders/:id/verify-token', summary: 'Withdraw the verify link', tag: 'Verify', access: 'any', roles: qa, status: 204, response: null },
  { method: 'get', path: '/welders/:id/timeline', summary: 'The welder’s continuity timeline', tag: 'Continuity', access: 'any', status: 200, response: timelineSchema },
  { method: 'get', path: '/welders/:id/qualified-on', summary: 'Whether the welder was qualified for a joint on a day, with the proof (qualification, continuity as of that day, revocation)', tag: 'Qualified on', access: 'any', query: qualifiedOnQueryFields, status: 200, response: qualifiedOnAnswerSchema },
  { method: 'get', path: '/crew-finder', summary: 'Who may weld a joint from today through a day (longest in force first), and the near misses with the one reason each', tag: 'Qualified on', access: 'any', roles: managers, query: crewFinderQueryFields, status: 200, response: crewFinderAnswerSchema },

  // records
  { method: 'get', path: '/procedures', summary: 'WPS register', tag: 'Procedures', access: 'any', roles: managers, query: procedureListQuery, status: 200, response: items(procedureSchema) },
  { method: 'get', path: '/procedures/:id', summary: 'One WPS', tag: 'Procedures', access: 'any', roles: managers, status: 200, response: procedureSchema },
  { method: 'post', path: '/procedures', summary: 'Add a WPS', tag: 'Procedures', access: 'any', roles: qa, body: procedureInput, status: 201, response: procedureSchema },
  { method: 'patch', path: '/procedures/:id', summary: 'Change a WPS', tag: 'Procedures', access: 'any', roles: qa, body: procedureUpdateInput, status: 200, response: procedureSchema },
  { method: 'get', path: '/coupons', summary: 'Coupons (qualification tests)', tag: 'Coupons', access: 'any', query: couponListQuery, status: 200, response: items(couponRecordSchema) },
  { method: 'get', path: '/coupons/:id', summary: 'One coupon with its evaluation', tag: 'Coupons', access: 'any', status: 200, response: couponRecordSchema },
  { method: 'post', path: '/coupons', summary: 'Record a coupon; the API evaluates it', tag: 'Coupons', access: 'any', roles: qa, body: couponRecordInput, status: 201, response: couponRecordSchema },
  { method: 'patch', path: '/coupons/:id', summary: 'Change a coupon not yet certified', tag: 'Coupons', access: 'any', roles: qa, body: couponUpdateInput, status: 200, response: couponRecordSchema },
  { method: 'post', path: '/coupons/:id/certify', summary: 'Certify an accepted coupon as a WPQ', tag: 'Coupons', access: 'any', roles: qa, body: certifyInput, status: 201, response: qualificationSchema },
  { method: 'get', path: '/qualifications', summary: 'Qualifications (WPQs)', tag: 'Qualifications', access: 'any', query: qualificationListQuery, status: 200, response: items(qualificationSchema) },
  { method: 'get', path: '/qualifications/:id', summary: 'One qualification with its ranges and clauses', tag: 'Qualifications', access: 'any', status: 200, response: qualificationSchema },
  { method: 'get', path: '/qualifications/:id/wpq.pdf', summary: 'The WPQ record', tag: 'Qualifications', access: 'any', status: 200, response: { binary: 'application/pdf' } },
  { method: 'post', path: '/qualifications/:id/revoke', summary: 'Revoke a qualification for cause', tag: 'Qualifications', access: 'any', roles: qa, body: revokeInput, status: 200, response: qualificationSchema },
  { method: 'post', path: '/uploads', summary: 'Attach a file (image or PDF)', tag: 'Uploads', access: 'any', roles: qa, multipart: z.object({ kind: z.string().optional() }), status: 201, response: uploadSchema },
  { method: 'get', path: '/uploads/:id', summary: 'An attached file’s record', tag: 'Uploads', access: 'any', status: 200, response: uploadSchema },
  { method: 'get', path: '/uploads/:id/content', summary: 'An attached file’s bytes', tag: 'Uploads', access: 'any', query: z.object({ inline: z.literal('1').optional() }), status: 200, response: { binary: 'application/octet-stream' } },
  { method: 'get', path: '/verify/:token', summary: 'Public verify page data of a welder (no sign-in)', tag: 'Verify', access: 'public', status: 200, response: verifySchema },

  // continuity and lapse watch
  { method: 'get', path: '/continuity/grid', summary: 'A shop’s continuity log for a month', tag: 'Continuity', access: 'any', roles: managers, query: gridQuery, status: 200, response: gridSchema },
  { method: 'put', path: '/continuity/grid', summary: 'Save cells of a shop’s month', tag: 'Continuity', access: 'any', roles: managers, body: gridSaveInput, status: 200, response: gridSchema },
  { method: 'get', path: '/continuity/welders', summary: 'Welders that can be added to a shop’s log', tag: 'Continuity', access: 'any', roles: managers, query: gridWeldersQuery, status: 200, response: gridWelderListSchema },
  { method: 'get', path: '/continuity/review', summary: 'Use logged while lapsed, waiting for review', tag: 'Continuity', access: 'any', roles: qa, status: 200, response: reviewQueueSchema },
  { method: 'post', path: '/continuity/entries/:id/review', summary: 'Mark logged use reviewed', tag: 'Continuity', access: 'any', roles: qa, body: reviewInput, status: 200, response: z.object({ id: z.string(), reviewStatus: z.literal('reviewed'), reviewDecision: z.enum(reviewDecisions), reviewNote: z.string() }) },
  { method: 'get', path: '/settings', summary: 'Company settings', tag: 'Settings', access: 'any', roles: qa, status: 200, response: companySettingsSchema },
  { method: 'patch', path: '/settings', summary: 'Change company settings', tag: 'Settings', access: 'any', roles: qa, body: companySettingsInput, status: 200, response: companySettingsSchema },
  { method: 'get', path: '/lapse-watch/preview', summary: 'What a lapse-watch run would send', tag: 'Lapse watch', access: 'any', roles: qa, query: lapseWatchPreviewQuery, status: 200, response: lapseWatchPreviewSchema },
  { method: 'post', path: '/lapse-watch/runs', summary: 'Run the lapse watch now', tag: 'Lapse watch', access: 'any', roles: qa, body: lapseWatchRunInput, status: 201, response: lapseWatchRunSchema },
  { method: 'get', path: '/lapse-watch/runs', summary: 'Past lapse-watch runs', tag: 'Lapse watch', access: 'any', roles: qa, status: 200, response: lapseWatchRunListSchema },
  { method: 'get', path: '/lapse-watch/notices', summary: 'Lapse notices and their delivery', tag: 'Lapse watch', access: 'any', roles: qa, query: lapseWatchNoticesQuery, status: 200, response: lapseNoticeListSchema },
  { method: 'get', path: '/overview', summary: 'The Overview figures', tag: 'Overview', access: 'any', roles: managers, status: 200, response: overviewSchema },
  { method: 'get', path: '/audit', summary: 'Audit trail, newest first', tag: 'Audit', access: 'any', roles: qa, query: auditListQuery, status: 200, response: pageOf(auditEventSchema) },

  // production welds (issue 12)
  { method: 'get', path: '/welds', summary: 'Production welds (by job, welder, shop, dates, flag)', tag: 'Welds', access: 'any', roles: managers, query: weldListQuery, status: 200, response: weldPageSchema },
  { method: 'post', path: '/welds', summary: 'Log a production weld, checked against each welder’s qualification on the date welded', tag: 'Welds', access: 'any', roles: managers, body: weldInput, status: 201, response: weldSchema },
  { method: 'get', path: '/welds/welders', summary: 'Welders who may be named on a weld of a shop, with their qualifications for the live check', tag: 'Welds', access: 'any', roles: managers, query: weldWelderQuery, status: 200, response: weldWelderListSchema },
  { method: 'get', path: '/welds/job-summary.csv', summary: 'Every weld of a job with its welders and check (CSV, one row per welder)', tag: 'Welds', access: 'any', roles: managers, query: jobSummaryQuery, status: 200, response: { binary: 'text/csv' } },
  { method: 'get', path: '/welds/job-summary.pdf', summary: 'Every weld of a job with its welders and check (PDF)', tag: 'Welds', access: 'any', roles: managers, query: jobSummaryQuery, status: 200, response: { binary: 'application/pdf' } },
  { method: 'get', path: '/welds/:id/pdf', summary: 'The weld page: who made it, whether each welder was qualified that day, and the proof', tag: 'Welds', access: 'any', roles: managers, status: 200, response: { binary: 'application/pdf' } },
  { method: 'get', path: '/welds/:id', summary: 'A production weld with its check and the proof of each welder', tag: 'Welds', access: 'any', roles: managers, status: 200, response: weldDetailSchema },
  { method: 'post', path: '/welds/:id/disposition', summary: 'The QA manager’s disposition of a flagged weld', tag: 'Welds', access: 'any', roles: qa, body: weldDispositionInput, status: 200, response: weldSchema },

  // API tokens
  { method: 'get', path: '/api-tokens', summary: 'API tokens of the company', tag: 'API tokens', access: 'session', roles: qa, status: 200, response: apiTokenListSchema },
  { method: 'post', path: '/api-tokens', summary: 'Create an API token (the secret is in this answer only)', tag: 'API tokens', access: 'session', roles: qa, body: apiTokenInput, status: 201, response: apiTokenCreatedSchema },
  { method: 'post', path: '/api-tokens/:id/revoke', summary: 'Revoke an API token', tag: 'API tokens', access: 'session', roles: qa, status: 200, response: apiTokenSchema },

  { method: 'get', path: '/openapi.json', summary: 'This description (OpenAPI 3.1)', tag: 'Health', access: 'public', status: 200, response: z.looseObject({ openapi: z.string(), paths: z.record(z.string(), z.unknown()) }) },

  // development only (never mounted in production)
  { method: 'get', path: '/dev/mail', summary: 'Mail caught by the local catcher, to the caller’s company (development only, this machine only)', tag: 'Development', access: 'session', status: 200, response: items(mailSummary) },
  { method: 'get', path: '/dev/mail/:id', summary: 'One caught message (development only, this machine only)', tag: 'Development', access: 'session', status: 200, response: mailSummary.extend({ text: z.string(), html: z.string() }) },
];

export function allRouteDocs(): RouteDoc[] {
  return [...coreRouteDocs, ...extraRouteDocs];
}
