import { z } from 'zod';
import * as c from '@plumbline/contracts';

/** Who may call a route: nobody signed in, a signed-in user, or also a lab API token. */
export type RouteAuth = 'none' | 'user' | 'user-or-lab-token';

export type RouteDoc = {
  method: 'get' | 'post' | 'put' | 'patch' | 'delete';
  /** Express style, relative to /api. */
  path: string;
  tag: string;
  summary: string;
  auth: RouteAuth;
  query?: z.ZodObject;
  body?: z.ZodType;
  /** How the body is sent when it is not JSON. */
  bodyKind?: 'multipart' | 'csv';
  status?: number;
  response?: z.ZodType;
  produces?: 'csv' | 'pdf';
};

const catalogueCreate = z.union([
  c.analyteCreateSchema,
  c.methodCreateSchema,
  c.instrumentModelCreateSchema,
  c.reagentCreateSchema,
  c.controlMaterialCreateSchema,
  c.controlLotCreateSchema,
]);
const catalogueUpdate = z.union([
  c.analyteUpdateSchema,
  c.methodUpdateSchema,
  c.instrumentModelUpdateSchema,
  c.reagentUpdateSchema,
  c.controlMaterialUpdateSchema,
  c.controlLotUpdateSchema,
]);
const uploadForm = z.object({
  file: z.string().describe('the CSV file (binary)'),
  kind: c.uploadKindSchema,
  labId: c.uuidSchema.optional().describe('coordinator only: the lab uploaded for'),
  mapping: z.string().optional().describe('JSON text: file column → canonical column'),
});

const labQuery = z.object({ labId: c.uuidSchema.optional().describe('coordinator only: the lab') });

const U = 'user' as const;

/**
 * Every API route with the contract schemas it reads and answers. The OpenAPI document is generated
 * from this list, and a test compares it with the routes Express actually serves.
 */
// One line per route, so the table reads as a list.
// prettier-ignore
export const routeDocs: RouteDoc[] = [
  { method: 'get', path: '/health', tag: 'Service', summary: 'Health of the API, PostgreSQL and Redis', auth: 'none', response: c.healthResponseSchema },
  { method: 'get', path: '/openapi.json', tag: 'Service', summary: 'This OpenAPI document', auth: 'none' },
  { method: 'get', path: '/reference', tag: 'Service', summary: 'A readable page of this API reference', auth: 'none' },
  { method: 'get', path: '/reference.js', tag: 'Service', summary: 'Script of the reference page', auth: 'none' },
  { method: 'get', path: '/reference.css', tag: 'Service', summary: 'Style sheet of the reference page', auth: 'none' },
  { method: 'post', path: '/auth/login', tag: 'Sign-in', summary: 'Sign in; sets the session and CSRF cookies', auth: 'none', body: c.loginRequestSchema, response: c.loginResponseSchema },
  { method: 'post', path: '/auth/logout', tag: 'Sign-in', summary: 'Sign out; ends the session', auth: U, status: 204 },
  { method: 'get', path: '/me', tag: 'Sign-in', summary: 'The signed-in user and their lab', auth: U, response: c.meResponseSchema },
  { method: 'get', path: '/labs', tag: 'Labs', summary: 'Labs the caller may see', auth: U },
  { method: 'get', path: '/labs/:labId', tag: 'Labs', summary: 'One lab', auth: U },
  { method: 'post', path: '/uploads', tag: 'Uploads', summary: 'Upload a monthly QC file', auth: 'user-or-lab-token', body: uploadForm, bodyKind: 'multipart', status: 202, response: c.uploadCreatedSchema },
  { method: 'post', path: '/uploads/preview', tag: 'Uploads', summary: 'Preview the first rows and the suggested column mapping', auth: U, body: uploadForm, bodyKind: 'multipart', response: c.uploadPreviewSchema },
  { method: 'get', path: '/uploads', tag: 'Uploads', summary: 'Uploads of a lab', auth: U, query: c.uploadListQuerySchema, response: c.uploadListSchema },
  { method: 'get', path: '/uploads/:id', tag: 'Uploads', summary: 'One upload with its row errors', auth: 'user-or-lab-token', response: c.uploadDetailSchema },
  { method: 'post', path: '/uploads/:id/confirm', tag: 'Uploads', summary: 'Store an upload held for confirmation', auth: U },
  { method: 'post', path: '/uploads/:id/cancel', tag: 'Uploads', summary: 'Discard an upload', auth: U },
  { method: 'get', path: '/labs/:labId/column-mappings/:kind', tag: 'Uploads', summary: "The lab's saved column mapping", auth: U, response: c.columnMappingResponseSchema },
  { method: 'put', path: '/labs/:labId/column-mappings/:kind', tag: 'Uploads', summary: "Save the lab's column mapping", auth: U, body: c.columnMappingUpdateSchema, response: c.columnMappingResponseSchema },
  { method: 'get', path: '/labs/:labId/api-tokens', tag: 'Lab API tokens', summary: "The lab's API tokens", auth: U, response: c.labApiTokenListSchema },
  { method: 'post', path: '/labs/:labId/api-tokens', tag: 'Lab API tokens', summary: 'Create a lab API token (shown once)', auth: U, body: c.labApiTokenCreateSchema, status: 201, response: c.labApiTokenCreatedSchema },
  { method: 'delete', path: '/labs/:labId/api-tokens/:tokenId', tag: 'Lab API tokens', summary: 'Revoke a lab API token', auth: U, status: 204 },
  { method: 'get', path: '/periods', tag: 'Lookups', summary: 'Monthly periods', auth: U, response: c.periodListSchema },
  { method: 'get', path: '/labs/:labId/procedures', tag: 'Lookups', summary: "The lab's procedures", auth: U, response: c.procedureListSchema },
  { method: 'get', path: '/control-lots', tag: 'Lookups', summary: 'Control lots', auth: U, response: c.controlLotSummaryListSchema },
  { method: 'get', path: '/labs/:labId/peer-report', tag: 'Reports', summary: 'Peer comparison report of a lab for a period', auth: U, query: c.peerReportQuerySchema, response: c.peerReportSchema },
  { method: 'get', path: '/audit-events', tag: 'Audit', summary: 'Audit log (coordinator)', auth: U, query: c.auditQuerySchema, response: c.auditPageSchema },
  { method: 'get', path: '/audit-events.csv', tag: 'Audit', summary: 'Audit log as CSV (coordinator)', auth: U, query: c.auditQuerySchema, produces: 'csv' },
  { method: 'get', path: '/catalogue/:list', tag: 'Catalogue', summary: 'Items of a catalogue list', auth: U, query: c.catalogueListQuerySchema },
  { method: 'post', path: '/catalogue/:list', tag: 'Catalogue', summary: 'Add a catalogue item (coordinator)', auth: U, body: catalogueCreate, status: 201 },
  { method: 'post', path: '/catalogue/:list/import', tag: 'Catalogue', summary: 'Import catalogue items from CSV (coordinator)', auth: U, query: c.catalogueImportQuerySchema, bodyKind: 'csv', response: c.importResultSchema },
  { method: 'patch', path: '/catalogue/:list/:id', tag: 'Catalogue', summary: 'Change a catalogue item (coordinator)', auth: U, body: catalogueUpdate },
  { method: 'post', path: '/catalogue/:list/:id/retire', tag: 'Catalogue', summary: 'Retire a catalogue item', auth: U, body: c.catalogueStateChangeSchema },
  { method: 'post', path: '/catalogue/:list/:id/restore', tag: 'Catalogue', summary: 'Restore a retired catalogue item', auth: U, body: c.catalogueStateChangeSchema },
  { method: 'post', path: '/labs', tag: 'Network', summary: 'Add a lab (coordinator)', auth: U, body: c.labCreateSchema, status: 201, response: c.labDetailSchema },
  { method: 'patch', path: '/labs/:labId', tag: 'Network', summary: 'Change a lab (coordinator)', auth: U, body: c.labUpdateSchema, response: c.labDetailSchema },
  { method: 'post', path: '/labs/:labId/deactivate', tag: 'Network', summary: 'Deactivate a lab (coordinator)', auth: U, body: c.labDeactivateSchema, response: c.labDetailSchema },
  { method: 'get', path: '/labs/:labId/users', tag: 'Lab users', summary: "The lab's users", auth: U, response: z.array(c.labUserSchema) },
  { method: 'patch', path: '/labs/:labId/users/:userId', tag: 'Lab users', summary: "Change a user's role or deactivate them", auth: U, body: c.labUserUpdateSchema, response: c.labUserSchema },
  { method: 'post', path: '/labs/:labId/invitations', tag: 'Lab users', summary: 'Invite a person to the lab', auth: U, body: c.invitationCreateSchema, status: 201, response: c.invitationCreatedSchema },
  { method: 'get', path: '/invitations/:token', tag: 'Lab users', summary: 'What an invitation link is for', auth: 'none', response: c.invitationInfoSchema },
  { method: 'post', path: '/invitations/accept', tag: 'Lab users', summary: 'Accept an invitation and set a password', auth: 'none', body: c.invitationAcceptSchema },
  { method: 'get', path: '/network/procedures', tag: 'Network', summary: 'Procedures across the network (coordinator)', auth: U, query: c.networkProceduresQuerySchema, response: c.networkProceduresPageSchema },
  { method: 'post', path: '/periods', tag: 'Cycles', summary: 'Open a period (coordinator)', auth: U, body: c.periodCreateSchema, status: 201, response: c.periodDetailSchema },
  { method: 'patch', path: '/periods/:period', tag: 'Cycles', summary: 'Change a period (coordinator)', auth: U, body: c.periodUpdateSchema, response: c.periodDetailSchema },
  { method: 'post', path: '/periods/:period/close', tag: 'Cycles', summary: 'Close a period', auth: U, body: c.periodCloseSchema, response: c.periodDetailSchema },
  { method: 'post', path: '/periods/:period/reopen', tag: 'Cycles', summary: 'Reopen a period', auth: U, body: c.periodReopenSchema, response: c.periodDetailSchema },
  { method: 'get', path: '/periods/:period/participation', tag: 'Cycles', summary: 'Participation board of a period', auth: U, query: c.participationQuerySchema, response: c.participationBoardSchema },
  { method: 'get', path: '/peer-groups', tag: 'Peer groups', summary: 'Peer groups of an analyte and lot', auth: U, query: c.peerGroupsQuerySchema, response: c.peerGroupsViewSchema },
  { method: 'get', path: '/peer-groups/analytes', tag: 'Peer groups', summary: 'Analytes with peer groups', auth: U, query: c.peerGroupAnalytesQuerySchema, response: c.peerGroupAnalyteListSchema },
  { method: 'get', path: '/lot-comparisons', tag: 'Peer groups', summary: 'Lot-to-lot comparison of peer means across a control lot change (coordinator)', auth: U, query: c.lotComparisonsQuerySchema, response: c.lotComparisonsSchema },
  { method: 'post', path: '/peer-groups/merge/preview', tag: 'Peer groups', summary: 'Preview merging groups', auth: U, body: c.mergePreviewRequestSchema, response: c.adjustmentPreviewSchema },
  { method: 'post', path: '/peer-groups/merge', tag: 'Peer groups', summary: 'Merge groups', auth: U, body: c.mergeRequestSchema },
  { method: 'post', path: '/peer-groups/split/preview', tag: 'Peer groups', summary: 'Preview splitting a group', auth: U, body: c.splitPreviewRequestSchema, response: c.adjustmentPreviewSchema },
  { method: 'post', path: '/peer-groups/split', tag: 'Peer groups', summary: 'Split a group', auth: U, body: c.splitRequestSchema },
  { method: 'post', path: '/peer-groups/move/preview', tag: 'Peer groups', summary: 'Preview moving a procedure', auth: U, body: c.movePreviewRequestSchema, response: c.adjustmentPreviewSchema },
  { method: 'post', path: '/peer-groups/move', tag: 'Peer groups', summary: 'Move a procedure to another group', auth: U, body: c.moveRequestSchema },
  { method: 'post', path: '/peer-groups/exclusions/preview', tag: 'Peer groups', summary: 'Preview excluding a lab', auth: U, body: c.exclusionPreviewRequestSchema, response: c.adjustmentPreviewSchema },
  { method: 'post', path: '/peer-groups/exclusions', tag: 'Peer groups', summary: 'Exclude a lab from a group', auth: U, body: c.exclusionRequestSchema },
  { method: 'get', path: '/peer-groups/adjustments', tag: 'Peer groups', summary: 'Adjustments made to peer groups', auth: U, query: c.adjustmentListQuerySchema, response: c.peerGroupAdjustmentListSchema },
  { method: 'post', path: '/peer-groups/adjustments/:id/undo', tag: 'Peer groups', summary: 'Undo an adjustment', auth: U, body: c.adjustmentUndoSchema },
  { method: 'post', path: '/periods/:period/publish', tag: 'Publishing', summary: 'Publish a period', auth: U, body: c.publishRequestSchema, response: c.publishResultSchema },
  { method: 'post', path: '/periods/:period/republish', tag: 'Publishing', summary: 'Publish a period again', auth: U, body: c.republishRequestSchema, response: c.publishResultSchema },
  { method: 'get', path: '/periods/:period/publications', tag: 'Publishing', summary: 'Publications of a period', auth: U, response: c.publicationListSchema },
  { method: 'get', path: '/labs/:labId/overview', tag: 'Lab workspace', summary: "The lab's overview", auth: U, response: c.labOverviewSchema },
  { method: 'get', path: '/labs/:labId/comments', tag: 'Lab workspace', summary: 'Corrective-action comments', auth: U, query: c.commentListQuerySchema, response: c.commentListSchema },
  { method: 'post', path: '/labs/:labId/comments', tag: 'Lab workspace', summary: 'Add a comment', auth: U, body: c.commentCreateSchema, status: 201, response: c.commentSchema },
  { method: 'patch', path: '/labs/:labId/comments/:commentId', tag: 'Lab workspace', summary: 'Change a comment', auth: U, body: c.commentUpdateSchema, response: c.commentSchema },
  { method: 'delete', path: '/labs/:labId/comments/:commentId', tag: 'Lab workspace', summary: 'Delete a comment', auth: U, status: 204 },
  { method: 'get', path: '/labs/:labId/signoffs', tag: 'Lab workspace', summary: "The lab's monthly sign-offs", auth: U, response: c.signoffListSchema },
  { method: 'get', path: '/labs/:labId/signoffs/:period', tag: 'Lab workspace', summary: 'Sign-off of one period', auth: U, response: c.periodSignoffSchema },
  { method: 'post', path: '/labs/:labId/signoffs', tag: 'Lab workspace', summary: 'Sign a period off', auth: U, body: c.signoffCreateSchema, status: 201 },
  { method: 'get', path: '/labs/:labId/test-menu', tag: 'Lab workspace', summary: "The lab's test menu", auth: U, response: c.testMenuSchema },
  { method: 'post', path: '/labs/:labId/procedures', tag: 'Lab workspace', summary: 'Add a procedure', auth: U, body: c.procedureCreateSchema, status: 201 },
  { method: 'patch', path: '/labs/:labId/procedures/:procedureId', tag: 'Lab workspace', summary: 'Change a procedure', auth: U, body: c.procedureUpdateSchema },
  { method: 'post', path: '/labs/:labId/procedures/:procedureId/retire', tag: 'Lab workspace', summary: 'Retire a procedure', auth: U, body: c.procedureStateChangeSchema },
  { method: 'post', path: '/labs/:labId/procedures/:procedureId/restore', tag: 'Lab workspace', summary: 'Restore a procedure', auth: U, body: c.procedureStateChangeSchema },
  { method: 'get', path: '/labs/:labId/report-rows/:procedureId/:controlLotId/:level', tag: 'Reports', summary: 'Trend and control chart of one report row', auth: U, query: c.drilldownQuerySchema, response: c.drilldownSchema },
  { method: 'get', path: '/labs/:labId/report-rows/:procedureId/:controlLotId/:level/trend.csv', tag: 'Reports', summary: 'Trend of one report row as CSV', auth: U, query: c.drilldownQuerySchema, produces: 'csv' },
  { method: 'get', path: '/labs/:labId/report-rows/:procedureId/:controlLotId/:level/levey-jennings.csv', tag: 'Reports', summary: 'Control chart values of one report row as CSV', auth: U, query: c.drilldownQuerySchema, produces: 'csv' },
  { method: 'get', path: '/labs/:labId/peer-report.csv', tag: 'Reports', summary: 'Peer report as CSV', auth: U, query: c.peerReportQuerySchema, produces: 'csv' },
  { method: 'get', path: '/labs/:labId/peer-report.pdf', tag: 'Reports', summary: 'Monthly report as PDF', auth: U, query: c.peerReportQuerySchema, produces: 'pdf' },
  { method: 'get', path: '/labs/:labId/comments.csv', tag: 'Reports', summary: 'Comments as CSV', auth: U, query: c.commentListQuerySchema, produces: 'csv' },
  { method: 'get', path: '/labs/:labId/test-menu.csv', tag: 'Reports', summary: 'Test menu as CSV', auth: U, produces: 'csv' },
  { method: 'get', path: '/labs/:labId/uploads.csv', tag: 'Reports', summary: 'Uploads as CSV', auth: U, produces: 'csv' },
  { method: 'get', path: '/peer-groups/failures', tag: 'Peer groups', summary: 'Peer groups the last recompute could not compute, with the reason', auth: U, query: c.peerStatisticsFailuresQuerySchema, response: c.peerStatisticsFailureListSchema },
  { method: 'get', path: '/reference-intervals/studies', tag: 'Reference intervals', summary: 'Reference-interval studies of a lab', auth: U, query: labQuery, response: z.array(c.studySummarySchema) },
  { method: 'post', path: '/reference-intervals/studies', tag: 'Reference intervals', summary: 'Create a study (supervisor)', auth: U, body: c.studyInputSchema, status: 201, response: c.studyDetailSchema },
  { method: 'post', path: '/reference-intervals/studies/count', tag: 'Reference intervals', summary: 'Count the patient results a selection matches', auth: U, body: c.studyCountQuerySchema, response: c.studyCountSchema },
  { method: 'get', path: '/reference-intervals/studies/:id', tag: 'Reference intervals', summary: 'One study with its results and versions', auth: U, response: c.studyDetailSchema },
  { method: 'post', path: '/reference-intervals/studies/:id/run', tag: 'Reference intervals', summary: 'Run a study again (a new version)', auth: U },
  { method: 'post', path: '/reference-intervals/studies/:id/versions/:version/approve', tag: 'Reference intervals', summary: 'Approve a study version with a statement (supervisor)', auth: U, body: c.approvalInputSchema },
  { method: 'get', path: '/reference-intervals/studies/:id/versions/:version/export.csv', tag: 'Reference intervals', summary: 'Study result as CSV', auth: U, produces: 'csv' },
  { method: 'get', path: '/reference-intervals/studies/:id/versions/:version/export.pdf', tag: 'Reference intervals', summary: 'Study result as PDF', auth: U, produces: 'pdf' },
  { method: 'get', path: '/reference-intervals/current', tag: 'Reference intervals', summary: 'Intervals the lab uses today', auth: U, query: labQuery, response: z.array(c.currentIntervalSchema) },
  { method: 'put', path: '/reference-intervals/current', tag: 'Reference intervals', summary: 'Enter or change a current interval (supervisor)', auth: U, body: c.currentIntervalInputSchema, response: c.currentIntervalSchema },
  { method: 'post', path: '/reference-intervals/current/adopt', tag: 'Reference intervals', summary: 'Adopt an approved study result as the current interval', auth: U, body: c.adoptInputSchema, response: c.currentIntervalSchema },
  { method: 'get', path: '/reference-intervals/verifications', tag: 'Reference intervals', summary: 'Verifications of transferred intervals', auth: U, query: labQuery, response: z.array(c.verificationSchema) },
  { method: 'post', path: '/reference-intervals/verifications', tag: 'Reference intervals', summary: 'Verify a transferred interval with 20 results', auth: U, body: c.verificationInputSchema, status: 201, response: c.verificationSchema },
  { method: 'get', path: '/reference-intervals/verifications/:id', tag: 'Reference intervals', summary: 'One verification with its rounds', auth: U, response: c.verificationSchema },
  { method: 'post', path: '/reference-intervals/verifications/:id/rounds', tag: 'Reference intervals', summary: 'Add a round of 20 more results', auth: U, body: c.verificationRoundInputSchema, response: c.verificationSchema },
  { method: 'post', path: '/reference-intervals/verifications/:id/approve', tag: 'Reference intervals', summary: 'Approve a verification record (supervisor)', auth: U, body: c.approvalInputSchema, response: c.verificationSchema },
  { method: 'get', path: '/labs/:labId/procedure-events', tag: 'QC insight', summary: 'Events recorded on the lab\'s procedures', auth: U, response: z.array(c.procedureEventSchema) },
  { method: 'post', path: '/labs/:labId/procedure-events', tag: 'QC insight', summary: 'Record procedure events from a CSV (procedure,date,kind,note); all or nothing', auth: 'user-or-lab-token', bodyKind: 'csv', status: 201, response: c.procedureEventImportSchema },
  { method: 'get', path: '/labs/:labId/procedures/:procedureId/events', tag: 'QC insight', summary: 'Events recorded on one procedure', auth: U, response: z.array(c.procedureEventSchema) },
  { method: 'post', path: '/labs/:labId/procedures/:procedureId/events', tag: 'QC insight', summary: 'Record an event on a procedure', auth: 'user-or-lab-token', body: c.procedureEventCreateSchema, status: 201, response: c.procedureEventSchema },
  { method: 'get', path: '/labs/:labId/procedures/:procedureId/shifts', tag: 'QC insight', summary: 'Shifts detected in the procedure\'s monthly SDI, with the events before them', auth: U, query: z.object({ controlLotId: c.uuidSchema.optional(), level: z.string().optional() }), response: c.procedureShiftsSchema },
  { method: 'get', path: '/labs/:labId/qc-plan', tag: 'QC insight', summary: 'Sigma, current and recommended QC plan of every procedure and level', auth: U, response: c.qcPlanPageSchema },
  { method: 'put', path: '/labs/:labId/qc-plan/:procedureId/:level', tag: 'QC insight', summary: 'Enter the QC plan a procedure and level uses today', auth: U, body: c.qcPlanInputSchema },
];
