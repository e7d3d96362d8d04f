import { z } from 'zod';
import type { RequestHandler } from 'express';
import { approvalSchema, boardQuerySchema, catalogItemSchema, catalogItemUpdateSchema, catalogQuerySchema, jobUpdateSchema, lineItemCreateSchema, lineItemUpdateSchema, myBenchQuerySchema, stageMoveSchema, timeLogSchema } from '../shared/jobs/schemas.js';
import { attachmentCreateSchema } from '../shared/files/limits.js';
import { auditLogQuerySchema, invitationAcceptSchema, invitationCreateSchema, membershipUpdateSchema, peopleQuerySchema, personUpdateSchema, roleAssignmentSchema } from '../shared/schemas/people.js';
import { closingDayInputSchema, relayRunInputSchema, relayRunQuerySchema, relayRunUpdateSchema, shopInputSchema, shopSkillsSchema, shopUpdateSchema, skillInputSchema, skillUpdateSchema, technicianSkillsSchema } from '../shared/schemas/shops.js';
import { heavyCaseSchema, createCustomerSchema, customerSearchSchema, importBatchSchema, instrumentSearchSchema, intakeSchema, serialCheckSchema, timelineQuerySchema } from '../shared/schemas/registry.js';
import { invoiceQuerySchema, jobListQuerySchema, reportScopeQuerySchema } from '../shared/reports/schemas.js';
import { padRulesSchema } from '../shared/padmap/rules.js';
import { savePadMapSchema } from '../shared/padmap/entries.js';
import { approveTransferSchema, createTransferSchema, handOverSchema, listTransfersQuery, packTransferSchema, reasonSchema, receiveTransferSchema, recommendationQuery, requestableJobsQuery } from '../shared/transfers.js';
// schemas still local to their routes (they move to shared/ with the forms that use them)
import { returnToSchema } from './modules/members/routes.js';
import { listQuery as noticesQuery, preferencesBody as noticePreferencesBody, readAllBody as noticesReadAllBody } from './modules/notifications/routes.js';
import { suggestionsQuery } from './modules/padmaps/routes.js';
import { adjustBody as stockAdjustBody, requestBody as partsRequestBody, stockQuery } from './modules/stock/routes.js';
import { customerDecisionSchema, jobCustomerUpdateSchema } from '../shared/customers/public-page.js';
import { hazardsSchema } from '../shared/safety/hazards.js';

/**
 * The API described: every route the app registers, with the shared zod schemas its route parses,
 * turned into an OpenAPI 3.1 document (zod 4's own JSON Schema output, draft 2020-12, which OpenAPI 3.1
 * uses as is). Served at GET /api/openapi.json to any signed-in person, not to the public: it holds no
 * data, but an anonymous scanner has no use for a map of every write; the people who build on the API
 * (a network's own staff and integrators) sign in anyway. tests/api/openapi.test.ts fails when a
 * registered route has no entry here, or an entry names a route that does not exist.
 *
 * Adding a route: add its line below with the schema its handler parses. Request shapes come from the
 * schemas; answers are described by status (the shared DTO types in shared/ are TypeScript, not zod).
 */

type Access = 'public' | 'signed-in';
interface Operation {
  tag: string;
  summary: string;
  /** Default 'signed-in': without a session the answer is 401. */
  access?: Access;
  query?: z.ZodType;
  body?: z.ZodType;
  /** Default JSON. */
  produces?: 'text/csv' | 'application/pdf' | 'redirect';
}

export const API_OPERATIONS: Record<string, Operation> = {
  'GET /api/jobs/:jobId/attachments': { tag: 'files', summary: "A job's photos and documents" },
  'POST /api/jobs/:jobId/attachments': { tag: 'files', summary: 'Start an upload (returns a presigned URL)', body: attachmentCreateSchema },
  'POST /api/attachments/:attachmentId/upload-url': { tag: 'files', summary: 'A fresh upload URL for a pending file' },
  'POST /api/attachments/:attachmentId/confirm': { tag: 'files', summary: 'Confirm an upload (checked in storage)' },
  'GET /api/attachments/:attachmentId/download': { tag: 'files', summary: 'A short-lived download link' },
  'DELETE /api/attachments/:attachmentId': { tag: 'files', summary: 'Remove a file' },
  'GET /api/instruments/:instrumentId/photos': { tag: 'files', summary: "An instrument's photos" },
  'GET /api/jobs': { tag: 'jobs', summary: 'The job board', query: boardQuerySchema },
  'GET /api/jobs/mine': { tag: 'jobs', summary: "My bench: the person's own jobs", query: myBenchQuerySchema },
  'GET /api/jobs/:jobId': { tag: 'jobs', summary: 'One job with its estimate, history and moves' },
  'PATCH /api/jobs/:jobId': { tag: 'jobs', summary: 'Change a job (promised date, assignee, notes)', body: jobUpdateSchema },
  'POST /api/jobs/:jobId/stage': { tag: 'jobs', summary: 'Move a job to another stage', body: stageMoveSchema },
  'POST /api/jobs/:jobId/line-items': { tag: 'jobs', summary: 'Add an estimate line', body: lineItemCreateSchema },
  'PATCH /api/jobs/:jobId/line-items/:itemId': { tag: 'jobs', summary: 'Change an estimate line', body: lineItemUpdateSchema },
  'DELETE /api/jobs/:jobId/line-items/:itemId': { tag: 'jobs', summary: 'Remove an estimate line' },
  'POST /api/jobs/:jobId/approval': { tag: 'jobs', summary: "Record the customer's approval of the estimate", body: approvalSchema },
  'POST /api/jobs/:jobId/time-logs': { tag: 'jobs', summary: 'Log time on a job', body: timeLogSchema },
  'DELETE /api/jobs/:jobId/time-logs/:logId': { tag: 'jobs', summary: 'Remove a time entry' },
  'GET /api/service-catalog': { tag: 'jobs', summary: 'The service catalog', query: catalogQuerySchema },
  'POST /api/service-catalog': { tag: 'jobs', summary: 'Add a service', body: catalogItemSchema },
  'PATCH /api/service-catalog/:itemId': { tag: 'jobs', summary: 'Change a service', body: catalogItemUpdateSchema },
  'GET /auth/login': { tag: 'people', summary: 'Start sign-in at the identity provider (browser redirect)', access: 'public', query: returnToSchema, produces: 'redirect' },
  'GET /auth/callback': { tag: 'people', summary: 'Return from the identity provider (browser redirect)', access: 'public', produces: 'redirect' },
  'POST /auth/logout': { tag: 'people', summary: 'Sign out', access: 'public' },
  'GET /api/me': { tag: 'people', summary: 'The signed-in person, their roles and the permission rules' },
  'GET /api/people': { tag: 'people', summary: 'People of the network', query: peopleQuerySchema },
  'GET /api/people/:id': { tag: 'people', summary: 'One person' },
  'PATCH /api/people/:id': { tag: 'people', summary: "Change a person's details", body: personUpdateSchema },
  'POST /api/people/:id/memberships': { tag: 'people', summary: 'Give a person a role at a shop', body: roleAssignmentSchema },
  'POST /api/people/:id/deactivate': { tag: 'people', summary: 'Deactivate a person' },
  'POST /api/people/:id/reactivate': { tag: 'people', summary: 'Reactivate a person' },
  'PATCH /api/memberships/:id': { tag: 'people', summary: 'Change a role', body: membershipUpdateSchema },
  'DELETE /api/memberships/:id': { tag: 'people', summary: 'Remove a role' },
  'GET /api/audit-log': { tag: 'people', summary: 'Audit log of changes to people, roles and shops', query: auditLogQuerySchema },
  'GET /api/invitations': { tag: 'people', summary: 'Open invitations' },
  'POST /api/invitations': { tag: 'people', summary: 'Invite someone', body: invitationCreateSchema },
  'DELETE /api/invitations/:id': { tag: 'people', summary: 'Withdraw an invitation' },
  'POST /api/invitations/:id/resend': { tag: 'people', summary: 'Send an invitation again' },
  'GET /api/invitations/preview/:token': { tag: 'people', summary: 'What an invitation link offers (before sign-in)', access: 'public' },
  'POST /api/invitations/accept': { tag: 'people', summary: 'Accept an invitation', body: invitationAcceptSchema },
  'GET /api/shops/summary': { tag: 'shops', summary: 'Every shop with its open work' },
  'GET /api/shops': { tag: 'shops', summary: 'Shops of the network' },
  'POST /api/shops': { tag: 'shops', summary: 'Open a shop', body: shopInputSchema },
  'GET /api/shops/:id': { tag: 'shops', summary: 'One shop' },
  'PATCH /api/shops/:id': { tag: 'shops', summary: 'Change a shop', body: shopUpdateSchema },
  'PUT /api/shops/:id/skills': { tag: 'shops', summary: 'Set the skills a shop offers', body: shopSkillsSchema },
  'PUT /api/shops/:id/technician-skills': { tag: 'shops', summary: "Set the skills of a shop's technicians", body: technicianSkillsSchema },
  'GET /api/shops/:id/closing-days': { tag: 'shops', summary: "A shop's closing days and public holidays" },
  'POST /api/shops/:id/closing-days': { tag: 'shops', summary: 'Add a closing day', body: closingDayInputSchema },
  'DELETE /api/shops/:id/closing-days/:date': { tag: 'shops', summary: 'Remove a closing day' },
  'GET /api/skills': { tag: 'shops', summary: 'Skills of the network' },
  'POST /api/skills': { tag: 'shops', summary: 'Add a skill', body: skillInputSchema },
  'PATCH /api/skills/:id': { tag: 'shops', summary: 'Change a skill', body: skillUpdateSchema },
  'GET /api/relay-runs': { tag: 'shops', summary: 'Relay runs between shops', query: relayRunQuerySchema },
  'POST /api/relay-runs': { tag: 'shops', summary: 'Add a relay run', body: relayRunInputSchema },
  'PATCH /api/relay-runs/:id': { tag: 'shops', summary: 'Change a relay run', body: relayRunUpdateSchema },
  'DELETE /api/relay-runs/:id': { tag: 'shops', summary: 'Remove a relay run' },
  'GET /api/notifications': { tag: 'notifications', summary: "The person's notices", query: noticesQuery },
  'GET /api/notifications/unread-count': { tag: 'notifications', summary: 'How many notices are unread' },
  'POST /api/notifications/read-all': { tag: 'notifications', summary: 'Mark notices read', body: noticesReadAllBody },
  'POST /api/notifications/:id/read': { tag: 'notifications', summary: 'Mark one notice read' },
  'GET /api/notification-preferences': { tag: 'notifications', summary: 'Which notices also come by e-mail' },
  'PUT /api/notification-preferences': { tag: 'notifications', summary: 'Choose which notices also come by e-mail', body: noticePreferencesBody },
  'GET /api/pad-rules': { tag: 'pad maps', summary: "The network's pad rules" },
  'PUT /api/pad-rules': { tag: 'pad maps', summary: "Change the network's pad rules", body: padRulesSchema },
  'GET /api/jobs/:jobId/pad-map': { tag: 'pad maps', summary: "A job's pad map screen: readings, results, stock and suggestions" },
  'PUT /api/jobs/:jobId/pad-map': { tag: 'pad maps', summary: "Save a job's pad map (becomes its pad lines and reservations)", body: savePadMapSchema },
  'GET /api/instruments/:instrumentId/pad-map': { tag: 'pad maps', summary: "An instrument's newest pad map" },
  'GET /api/pad-maps/suggestions': { tag: 'pad maps', summary: 'Sizes suggested from earlier maps of the same maker and model', query: suggestionsQuery },
  'GET /api/instruments/search': { tag: 'registry', summary: 'Search the registry by serial and more', query: instrumentSearchSchema },
  'GET /api/instruments/export.csv': { tag: 'registry', summary: 'The registry search as CSV', query: instrumentSearchSchema, produces: 'text/csv' },
  'GET /api/instruments/serial-check': { tag: 'registry', summary: 'Is this serial already registered (and near misses)', query: serialCheckSchema },
  'POST /api/instruments/import': { tag: 'registry', summary: 'Import a rental fleet', body: importBatchSchema },
  'GET /api/instruments/:id': { tag: 'registry', summary: 'One instrument' },
  'PATCH /api/instruments/:id/heavy-case': { tag: 'registry', summary: 'Mark whether an instrument travels in a heavy case (lifting caution)', body: heavyCaseSchema },
  'PUT /api/parts/:partId/hazards': { tag: 'stock', summary: "Set a part's hazard tags (owner)", body: z.object({ hazards: hazardsSchema }) },
  'POST /api/jobs/:jobId/customer-link': { tag: 'customers', summary: "Issue a private link to the job's customer page (shown once)" },
  'DELETE /api/jobs/:jobId/customer-link': { tag: 'customers', summary: "Revoke every link to the job's customer page" },
  'POST /api/jobs/:jobId/estimate/send': { tag: 'customers', summary: 'E-mail the estimate with a PDF and a fresh link' },
  'PATCH /api/jobs/:jobId/customer': { tag: 'customers', summary: "The job's customer: purchase order, tax-exempt certificate, notices", body: jobCustomerUpdateSchema },
  'GET /api/jobs/:jobId/claim-ticket.pdf': { tag: 'customers', summary: 'The claim ticket with the QR code and signature line', produces: 'application/pdf' },
  'GET /api/public/jobs/:token': { tag: 'customers', summary: "The customer's page of a job (the token is the key; rate limited)", access: 'public' },
  'POST /api/public/jobs/:token/decision': { tag: 'customers', summary: 'The customer approves or declines the estimate (rate limited)', access: 'public', body: customerDecisionSchema },
  'GET /api/instruments/:id/timeline': { tag: 'registry', summary: "An instrument's work history across shops", query: timelineQuerySchema },
  'GET /api/customers': { tag: 'registry', summary: 'Search customers', query: customerSearchSchema },
  'POST /api/customers': { tag: 'registry', summary: 'Add a customer', body: createCustomerSchema },
  'POST /api/intake': { tag: 'registry', summary: 'Check an instrument in and open its job', body: intakeSchema },
  'GET /api/reports/dashboard': { tag: 'reports', summary: "The dashboard's figures", query: reportScopeQuerySchema },
  'GET /api/reports/overdue': { tag: 'reports', summary: 'Overdue jobs', query: reportScopeQuerySchema },
  'GET /api/reports/transfers': { tag: 'reports', summary: 'Transfers report', query: reportScopeQuerySchema },
  'GET /api/reports/jobs': { tag: 'reports', summary: 'Jobs report', query: jobListQuerySchema },
  'GET /api/reports/open-jobs.csv': { tag: 'reports', summary: 'Open jobs as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/overdue.csv': { tag: 'reports', summary: 'Overdue jobs as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/transfers.csv': { tag: 'reports', summary: 'Transfers as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/bench-load.csv': { tag: 'reports', summary: 'Bench load as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/turnaround.csv': { tag: 'reports', summary: 'Turnaround as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/weekly-intake.csv': { tag: 'reports', summary: 'Weekly intake as CSV', query: reportScopeQuerySchema, produces: 'text/csv' },
  'GET /api/reports/jobs.csv': { tag: 'reports', summary: 'Jobs report as CSV', query: jobListQuerySchema, produces: 'text/csv' },
  'GET /api/reports/invoices.csv': { tag: 'reports', summary: 'Invoices as CSV', query: invoiceQuerySchema, produces: 'text/csv' },
  'GET /api/stock': { tag: 'stock', summary: 'Stock at a shop', query: stockQuery },
  'PATCH /api/stock/:shopId/parts/:partId': { tag: 'stock', summary: "Set a part's count or reorder point at a shop", body: stockAdjustBody },
  'POST /api/stock/part-transfers': { tag: 'stock', summary: 'Ask another shop for parts', body: partsRequestBody },
  'POST /api/stock/part-transfers/:id/send': { tag: 'stock', summary: 'Send requested parts' },
  'POST /api/stock/part-transfers/:id/receive': { tag: 'stock', summary: 'Take requested parts in' },
  'POST /api/stock/part-transfers/:id/cancel': { tag: 'stock', summary: 'Cancel a parts request' },
  'POST /api/jobs/:jobId/reservations/release': { tag: 'stock', summary: "Release a job's reserved parts" },
  'GET /api/transfers': { tag: 'transfers', summary: 'Transfers', query: listTransfersQuery },
  'GET /api/transfers/recommendation': { tag: 'transfers', summary: 'Where a job should go, ranked', query: recommendationQuery },
  'GET /api/transfers/requestable-jobs': { tag: 'transfers', summary: 'Jobs that may be transferred', query: requestableJobsQuery },
  'POST /api/transfers': { tag: 'transfers', summary: 'Request a transfer', body: createTransferSchema },
  'GET /api/transfers/:id': { tag: 'transfers', summary: 'One transfer with its timeline' },
  'GET /api/transfers/:id/manifest': { tag: 'transfers', summary: "A transfer's manifest (PDF)", produces: 'application/pdf' },
  'POST /api/transfers/:id/approve': { tag: 'transfers', summary: 'Approve a transfer (queued)', body: approveTransferSchema },
  'POST /api/transfers/:id/reject': { tag: 'transfers', summary: 'Reject a transfer (queued)', body: reasonSchema },
  'POST /api/transfers/:id/cancel': { tag: 'transfers', summary: 'Cancel a transfer (queued)', body: reasonSchema },
  'POST /api/transfers/:id/pack': { tag: 'transfers', summary: 'Pack a transfer (queued)', body: packTransferSchema },
  'POST /api/transfers/:id/hand-over': { tag: 'transfers', summary: 'Hand a transfer over to the run or courier (queued)', body: handOverSchema },
  'POST /api/transfers/:id/receive': { tag: 'transfers', summary: 'Receive a transfer, confirming the serial (queued)', body: receiveTransferSchema },
  'GET /api/health': { tag: 'platform', summary: 'Health of the database, storage, mail and queue', access: 'public' },
  'GET /api/openapi.json': { tag: 'platform', summary: 'This description of the API (OpenAPI 3.1)' },
  'GET /api/dev/mail': { tag: 'platform', summary: "Development only: the mail catcher's messages", access: 'public' },
};

/** `/api/jobs/:jobId` → `/api/jobs/{jobId}` and its path parameters. */
function openApiPath(path: string) {
  const params: string[] = [];
  const converted = path.replace(/:([A-Za-z0-9_]+)/g, (_m, name: string) => {
    params.push(name);
    return `{${name}}`;
  });
  return { converted, params };
}

/** JSON Schema of what a client sends (the input side of transforms and defaults); parts zod cannot express become `{}`. */
function jsonSchema(schema: z.ZodType) {
  const { $schema: _ignored, ...rest } = z.toJSONSchema(schema, { io: 'input', unrepresentable: 'any' }) as Record<string, unknown>;
  return rest;
}

function queryParameters(schema: z.ZodType) {
  const json = jsonSchema(schema) as { properties?: Record<string, unknown>; required?: string[] };
  return Object.entries(json.properties ?? {}).map(([name, s]) => ({
    name,
    in: 'query',
    required: (json.required ?? []).includes(name),
    schema: s,
  }));
}

const errorSchema = {
  type: 'object',
  required: ['error'],
  properties: {
    error: {
      type: 'object',
      required: ['code', 'message'],
      properties: {
        code: { type: 'string', examples: ['invalid_request', 'not_found', 'forbidden', 'conflict'] },
        message: { type: 'string', description: 'For people; shown as is.' },
        fields: { type: 'object', additionalProperties: { type: 'string' }, description: 'Field path → message, beside the very field.' },
        requestId: { type: 'string', description: 'The request id (also the X-Request-Id header), to quote when asking for help.' },
      },
    },
  },
};

function responsesFor(key: string, op: Operation) {
  const errorAnswer = (description: string) => ({ description, content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } } });
  const ok =
    op.produces === 'redirect'
      ? { '302': { description: 'Redirect' } }
      : op.produces
        ? { '200': { description: 'OK', content: { [op.produces]: {} } } }
        : key.startsWith('POST /api/transfers/') && key !== 'POST /api/transfers'
          ? { '202': { description: 'Accepted: the step is queued', content: { 'application/json': {} } } }
          : { '200': { description: 'OK', content: { 'application/json': {} } } };
  return {
    ...ok,
    ...(op.body || op.query ? { '400': errorAnswer('Input that needs attention; `fields` names each field') } : {}),
    ...(op.access === 'public' ? {} : { '401': errorAnswer('Not signed in') }),
    '403': errorAnswer('Not allowed, or a write from another site'),
    '404': errorAnswer('Not found in the caller’s network'),
    '409': errorAnswer('Not possible in the record’s present state'),
  };
}

let cached: Record<string, unknown> | undefined;

/** The OpenAPI 3.1 document; built once per process. */
export function openApiDocument() {
  if (cached) return cached;
  const paths: Record<string, Record<string, unknown>> = {};
  for (const [key, op] of Object.entries(API_OPERATIONS)) {
    const [method, path] = key.split(' ') as [string, string];
    const { converted, params } = openApiPath(path);
    paths[converted] ??= {};
    paths[converted][method.toLowerCase()] = {
      tags: [op.tag],
      summary: op.summary,
      operationId: key.replace(/[^A-Za-z0-9]+/g, '_').replace(/_+$/, ''),
      ...(op.access === 'public' ? { security: [] } : {}),
      parameters: [
        ...params.map((name) => ({ name, in: 'path', required: true, schema: { type: 'string' } })),
        ...(op.query ? queryParameters(op.query) : []),
      ],
      ...(op.body ? { requestBody: { required: true, content: { 'application/json': { schema: jsonSchema(op.body) } } } } : {}),
      responses: responsesFor(key, op),
    };
  }
  cached = {
    openapi: '3.1.0',
    info: {
      title: 'Benchrelay API',
      version: '1',
      description:
        'Signed-in calls use the session cookie set by sign-in (/auth/login). Writes from another site are refused (403 cross_site). ' +
        'Every answer carries X-Request-Id; error answers repeat it as error.requestId.',
    },
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    servers: [{ url: '/' }],
    components: {
      securitySchemes: { session: { type: 'apiKey', in: 'cookie', name: 'benchrelay.sid' } },
      schemas: { Error: errorSchema },
    },
    security: [{ session: [] }],
    paths,
  };
  return cached;
}

export const openApiHandler: RequestHandler = (_req, res) => {
  res.json(openApiDocument());
};
