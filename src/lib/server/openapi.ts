import { z } from 'zod';
import * as auditContracts from '~/contracts/audit';
import * as binPlanContracts from '~/contracts/bin-plans';
import * as binContracts from '~/contracts/bins';
import * as commonContracts from '~/contracts/common';
import * as deviceTypeContracts from '~/contracts/device-types';
import * as estimateContracts from '~/contracts/estimates';
import * as labelContracts from '~/contracts/labels';
import * as locationContracts from '~/contracts/locations';
import * as lotContracts from '~/contracts/lots';
import * as matchContracts from '~/contracts/match';
import * as partContracts from '~/contracts/parts';
import * as pickListContracts from '~/contracts/pick-lists';
import * as reservationContracts from '~/contracts/reservations';
import * as reviewContracts from '~/contracts/review';
import * as sessionContracts from '~/contracts/session';
import * as stationContracts from '~/contracts/stations';
import * as statisticsContracts from '~/contracts/statistics';
import * as stockContracts from '~/contracts/stock';
import * as uploadContracts from '~/contracts/uploads';
import * as userContracts from '~/contracts/users';

/**
 * The OpenAPI 3.1 description of `/api/**`, generated from the zod contracts in src/contracts
 * (responses, request bodies and queries). `GET /api/openapi.json` serves it;
 * `tests/unit/openapi.test.ts` checks that every route file and method is in it and that every
 * JSON body and query is described by a contract.
 */

export type ApiMethod = 'get' | 'post' | 'put' | 'delete';

export interface ApiOperation {
  summary: string;
  /** Answered without signing in. */
  public?: boolean;
  /** Contracts whose keys are the query parameters (several when a route reads more than one). */
  query?: z.ZodObject | z.ZodObject[];
  /** The JSON request body's contract. */
  body?: z.ZodType;
  /** A multipart/form-data body: the contract of its text fields, besides the `file` parts. */
  form?: z.ZodObject;
  /** The JSON answer on success; absent for routes without a contract yet (a generic object). */
  response?: z.ZodType;
  /** Success status, 200 unless said. */
  status?: number;
  /** A non-JSON answer (CSV, SPICE text, images), by media type. */
  produces?: string;
}

const csv = 'text/csv';

/** Every API route (OpenAPI path form, `{param}` for `[param]`) and what each method takes and gives. */
export const API_OPERATIONS: Record<string, Partial<Record<ApiMethod, ApiOperation>>> = {
  '/api/admin/audit': { get: { summary: 'The audit log, newest first, filtered and paged', query: auditContracts.AuditLogQuery, response: auditContracts.AuditLogPage } },
  '/api/admin/device-types': {
    get: { summary: 'Device types with their test conditions and specification limits', response: deviceTypeContracts.DeviceTypeList },
    post: { summary: 'Create a device type', body: deviceTypeContracts.DeviceTypeInput, response: deviceTypeContracts.DeviceTypeJson, status: 201 },
  },
  '/api/admin/device-types/{id}': { put: { summary: 'Change a device type', body: deviceTypeContracts.DeviceTypeInput, response: deviceTypeContracts.DeviceTypeJson } },
  '/api/admin/stations': {
    get: { summary: 'Test-station tokens (names and dates, never the token)', response: stationContracts.StationList },
    post: { summary: 'Issue a station token (shown once in the answer)', body: stationContracts.CreateStationInput, response: stationContracts.StationCreated, status: 201 },
  },
  '/api/admin/stations/{id}': { delete: { summary: "Revoke a station's token", response: stationContracts.StationRevoked } },
  '/api/admin/users': {
    get: { summary: 'People with their roles', response: userContracts.UserList },
    post: { summary: 'Invite a person by e-mail with roles', body: userContracts.InviteUserInput, response: userContracts.UserInvited, status: 201 },
  },
  '/api/admin/users/{id}/disabled': { put: { summary: 'Disable or enable a person', body: userContracts.SetDisabledRequest, response: userContracts.UserDisabledSet } },
  '/api/admin/users/{id}/roles': { put: { summary: "Set a person's roles", body: userContracts.SetRolesRequest, response: userContracts.UserRolesSet } },
  '/api/auth/{all}': {
    get: { summary: 'Sign-in, sessions and password reset (better-auth routes under /api/auth/)' },
    post: { summary: 'Sign-in, sign-out and password reset (better-auth routes under /api/auth/)' },
  },
  '/api/bin-plans': {
    get: { summary: 'Every version of every bin plan, newest first within each type', query: binPlanContracts.BinPlanListQuery, response: binPlanContracts.BinPlanList },
    post: { summary: "Save a plan as the type's next version and activate it (re-binning moved parts)", body: binPlanContracts.BinPlanDraft, response: binPlanContracts.BinPlanActivated, status: 201 },
  },
  '/api/bin-plans/{id}': { get: { summary: 'One bin plan version with its bins', response: binPlanContracts.BinPlanDetail } },
  '/api/bin-plans/preview': { post: { summary: 'What saving a plan would move; nothing is saved', body: binPlanContracts.BinPlanDraft, response: binPlanContracts.BinPlanPreview } },
  '/api/bins': { get: { summary: 'Bins of the active plans with on-hand, reserved and issued counts', query: binContracts.BinStockQuery, response: binContracts.BinStockPage } },
  '/api/bins/{id}': {
    get: { summary: 'One bin with its counts', response: binContracts.BinJson },
    put: { summary: "Set a bin's home location and/or low-stock threshold", body: binContracts.UpdateBinInput, response: binContracts.BinJson },
  },
  '/api/bins/{id}/parts': { get: { summary: 'Parts in one bin with their figures and location', query: binContracts.BinPartsQuery, response: binContracts.BinPartsPage } },
  '/api/bins/export.csv': { get: { summary: 'The bin stock table as CSV (every page)', query: binContracts.BinStockQuery, produces: csv } },
  '/api/bins/map': { get: { summary: "A device type's bins as a grid over its plan axes", query: binContracts.BinMapQuery, response: binContracts.BinMapJson } },
  '/api/estimates/mixer': { post: { summary: 'Square-law mixer products for data-sheet IDSS/VP or a stored part', body: estimateContracts.MixerRequest, response: estimateContracts.MixerEstimateJson } },
  '/api/estimates/parts/{serial}/mixer': { post: { summary: "The mixer estimate for a stored part's current fit", body: estimateContracts.MixerRequest, response: estimateContracts.MixerEstimateJson } },
  '/api/estimates/parts/{serial}/self-bias': { post: { summary: "The self-bias estimate for a stored part's current fit", body: estimateContracts.SelfBiasRequest, response: estimateContracts.SelfBiasEstimateJson } },
  '/api/estimates/self-bias': { post: { summary: 'Source resistor for a drain current and/or the current a resistor sets', body: estimateContracts.SelfBiasRequest, response: estimateContracts.SelfBiasEstimateJson } },
  '/api/estimates/set': { post: { summary: "Every part of a reservation's sets (or a serial list) at one operating point", body: estimateContracts.SetRequest, response: estimateContracts.MatchedSetEstimateJson } },
  '/api/health': { get: { summary: 'Whether the server and its database answer', public: true, response: sessionContracts.HealthJson } },
  '/api/labels/barcode': { get: { summary: 'A barcode rendered on the server (SVG, or PNG with format=png)', query: labelContracts.BarcodeQuery, produces: 'image/svg+xml' } },
  '/api/locations': {
    get: { summary: 'Storage locations', response: locationContracts.LocationList },
    post: { summary: 'Create a location', body: locationContracts.LocationInput, response: locationContracts.LocationRecord, status: 201 },
  },
  '/api/locations/{id}': {
    put: { summary: 'Change a location', body: locationContracts.LocationPatch, response: locationContracts.LocationRecord },
    delete: { summary: 'Delete an empty location', response: locationContracts.LocationDeleted },
  },
  '/api/lots': {
    get: { summary: 'Lots with their device type and supplier', response: lotContracts.LotList },
    post: { summary: 'Create a lot', body: lotContracts.CreateLotInput, response: lotContracts.LotCreated, status: 201 },
  },
  '/api/match/device-types': { get: { summary: 'Device types a designer can match from, with what is in stock', response: matchContracts.MatchableTypeList } },
  '/api/match/proposals': { post: { summary: 'Propose matched sets from stock (stored; confirm it to reserve)', body: matchContracts.ProposalRequest, response: matchContracts.ProposalView, status: 201 } },
  '/api/match/proposals/{id}': { get: { summary: 'One of your proposals', response: matchContracts.ProposalView } },
  '/api/match/proposals/{id}/confirm': { post: { summary: "Reserve every part of the proposal, or 409 naming the parts already taken", body: matchContracts.ConfirmRequest, response: pickListContracts.ReservationConfirmed, status: 201 } },
  '/api/match/proposals/{id}/sets/{set}/figures.csv': { get: { summary: "One proposed set's figures as CSV (sets numbered from 1)", produces: csv } },
  '/api/match/proposals/{id}/sets/{set}/model-cards': { get: { summary: 'SPICE .model cards of one proposed set', produces: 'text/plain' } },
  '/api/me': { get: { summary: 'The signed-in person (id, e-mail, roles, permissions) or the station', response: sessionContracts.MeJson } },
  '/api/openapi.json': { get: { summary: 'This document (OpenAPI 3.1)', public: true } },
  '/api/parts': { get: { summary: 'Parts with their current figures, filtered and paged, by serial', query: partContracts.ListPartsQuery, response: partContracts.PartsPage } },
  '/api/parts/{serial}': { get: { summary: 'A part with its current fit, test conditions, sweeps, model card and audit trail', response: partContracts.PartDetailJson } },
  '/api/parts/{serial}/model-card': { get: { summary: "The part's SPICE .model card as a download", produces: 'text/plain' } },
  '/api/parts/{serial}/operating-point': { get: { summary: "The part's VGS, gm and gos at a drain current and VDS", query: partContracts.OperatingPointQuery, response: partContracts.OperatingPointJson } },
  '/api/pick-lists': { get: { summary: 'Pick lists (?status=open|complete|cancelled|all)', query: pickListContracts.PickListQuery, response: pickListContracts.PickListList } },
  '/api/pick-lists/{id}': { get: { summary: 'One pick list with its lines', response: pickListContracts.PickListView } },
  '/api/pick-lists/{id}/returns': { post: { summary: 'Take back parts issued through this list', body: pickListContracts.PickReturnRequest, response: pickListContracts.PickReturnResult } },
  '/api/pick-lists/{id}/scan': { post: { summary: "Confirm a line by its part's serial; 409 with `refusal` when refused", body: pickListContracts.PickScanRequest, response: pickListContracts.PickScanResult } },
  '/api/reservations': { get: { summary: 'Reservations you may see', response: reservationContracts.ReservationList } },
  '/api/reservations/{id}': { get: { summary: 'One reservation with its sets and their figures', response: reservationContracts.ReservationView } },
  '/api/reservations/{id}/cancel': { post: { summary: 'Cancel an active reservation; its parts go back to stock', response: reservationContracts.ReservationCancelled } },
  '/api/reservations/{id}/sets/{set}/figures.csv': { get: { summary: "One reserved set's figures as CSV (sets numbered from 1)", produces: csv } },
  '/api/reservations/{id}/sets/{set}/model-cards': { get: { summary: 'SPICE .model cards of one reserved set', produces: 'text/plain' } },
  '/api/review': { get: { summary: 'The review queue (fits waiting for a decision)', query: reviewContracts.ReviewQueueQuery, response: reviewContracts.ReviewQueue } },
  '/api/review/{serial}/accept': { post: { summary: "Accept a part's current fit", body: reviewContracts.FitDecisionRequest, response: reviewContracts.FitAccepted } },
  '/api/review/{serial}/refit': { post: { summary: 'Fit again with points left out', body: reviewContracts.RefitRequest, response: reviewContracts.RefitResult } },
  '/api/review/{serial}/retest': { post: { summary: 'Mark a part for retest', body: reviewContracts.FitDecisionRequest, response: reviewContracts.RetestResult } },
  '/api/review/accept': { post: { summary: "Accept several parts' fits in one transaction", body: reviewContracts.AcceptFitsRequest, response: reviewContracts.FitsAccepted } },
  '/api/statistics': { get: { summary: 'Statistics of a lot, a device type and/or a date range, one group per type', query: statisticsContracts.StatisticsQuery, response: statisticsContracts.StatisticsReport } },
  '/api/statistics/export': { get: { summary: 'One table of the statistics report as CSV', query: [statisticsContracts.StatisticsExportQuery, statisticsContracts.StatisticsQuery], produces: csv } },
  '/api/statistics/options': { get: { summary: 'Device types and lots to choose from', response: statisticsContracts.StatisticsOptions } },
  '/api/stock/awaiting': { get: { summary: 'Lots with accepted parts waiting to be received into stock', response: stockContracts.AwaitingLotList } },
  '/api/stock/lookup': { get: { summary: 'What a scanned part is and what stores may do with it', query: stockContracts.StockLookupQuery, response: stockContracts.PartLookup } },
  '/api/stock/move': { post: { summary: 'Move a batch of parts to a location (one transaction)', body: stockContracts.MoveInput, response: stockContracts.StockActionResult } },
  '/api/stock/receive': { post: { summary: 'Receive a batch of parts into stock (one transaction)', body: stockContracts.ReceiveInput, response: stockContracts.StockActionResult } },
  '/api/stock/return': { post: { summary: 'Return a batch of issued parts (one transaction)', body: stockContracts.ReturnInput, response: stockContracts.StockActionResult } },
  '/api/stock/scrap': { post: { summary: 'Scrap a batch of parts (one transaction)', body: stockContracts.ScrapInput, response: stockContracts.StockActionResult } },
  '/api/stores/count': { post: { summary: "Compare a location's scanned parts with the records; apply: true corrects them", body: stockContracts.StockCountInput, response: stockContracts.StockCountJson } },
  '/api/sweeps': { post: { summary: 'Upload sweep files (multipart: `file` fields, tags lot/device_type/…); answers 202 at once', form: uploadContracts.UploadTags, response: uploadContracts.UploadReceived, status: 202 } },
  '/api/uploads/{id}': { get: { summary: 'An upload and the state of each of its files', response: uploadContracts.UploadStatus } },
  '/api/uploads/{id}/summary': { get: { summary: 'The upload per lot: fitted, flagged, refused by reason', response: uploadContracts.UploadSummaryJson } },
  '/api/uploads/{id}/summary-mail': { post: { summary: "Mail one lot's summary of this upload", body: uploadContracts.LotSummaryMailRequest, response: uploadContracts.LotSummaryMailed } },
};

/** `/api/bins/[id]` → `/api/bins/{id}`; a rest segment `[...all]` → `{all}`. */
export function openApiPath(route: string): string {
  return route.replace(/\[(?:\.\.\.)?([^\]]+)\]/g, '{$1}');
}

type JsonSchema = Record<string, unknown>;

function jsonSchema(schema: z.ZodType, io: 'input' | 'output'): JsonSchema {
  const { $schema: _drop, ...rest } = z.toJSONSchema(schema, { target: 'draft-2020-12', unrepresentable: 'any', io }) as JsonSchema;
  return rest;
}

/** Contract schemas by the name they are exported under, for `components.schemas`. */
function contractNames(): Map<z.ZodType, string> {
  const names = new Map<z.ZodType, string>();
  const modules = [
    commonContracts,
    deviceTypeContracts,
    auditContracts,
    partContracts,
    binPlanContracts,
    binContracts,
    estimateContracts,
    labelContracts,
    matchContracts,
    statisticsContracts,
    reservationContracts,
    pickListContracts,
    stockContracts,
    userContracts,
    stationContracts,
    locationContracts,
    lotContracts,
    reviewContracts,
    uploadContracts,
    sessionContracts,
  ];
  for (const mod of modules) {
    for (const [name, value] of Object.entries(mod)) if (value instanceof z.ZodType && !names.has(value)) names.set(value, name);
  }
  return names;
}

const ERROR_SCHEMA: JsonSchema = {
  type: 'object',
  description: 'Every error answer of /api/: a permanent code, a sentence saying what happened and what to do, and details for programs.',
  properties: {
    error: {
      type: 'object',
      properties: { code: { type: 'string' }, message: { type: 'string' } },
      required: ['code', 'message'],
      additionalProperties: true,
    },
  },
  required: ['error'],
};

/** A multipart body: the text fields' contract and any number of `file` parts. */
function formSchema(fields: JsonSchema): JsonSchema {
  return { allOf: [fields, { type: 'object', properties: { file: { type: 'array', items: { type: 'string', contentMediaType: 'application/octet-stream' } } }, required: ['file'] }] };
}

const GENERIC_OBJECT: JsonSchema = { type: 'object', description: 'A JSON object; this route has no published contract yet.', additionalProperties: true };

/** The OpenAPI 3.1 document for every route in `API_OPERATIONS`. */
export function buildOpenApiDocument(): Record<string, unknown> {
  const names = contractNames();
  const components: Record<string, JsonSchema> = { ApiError: ERROR_SCHEMA };
  const ref = (schema: z.ZodType, io: 'input' | 'output'): JsonSchema => {
    const name = names.get(schema);
    if (!name) return jsonSchema(schema, io);
    components[name] ??= jsonSchema(schema, io);
    return { $ref: `#/components/schemas/${name}` };
  };

  const paths: Record<string, Record<string, unknown>> = {};
  for (const [path, methods] of Object.entries(API_OPERATIONS)) {
    const pathParams = [...path.matchAll(/\{([^}]+)\}/g)].map((m) => ({ name: m[1], in: 'path', required: true, schema: { type: 'string' } }));
    const item: Record<string, unknown> = {};
    for (const [method, op] of Object.entries(methods) as [ApiMethod, ApiOperation][]) {
      const queryParams = [op.query ?? []].flat().flatMap((query) =>
        Object.entries(query.shape).map(([name, field]) => ({
          name,
          in: 'query',
          required: !(field as z.ZodType).safeParse(undefined).success,
          schema: jsonSchema(field as z.ZodType, 'input'),
        })),
      );
      const parameters = [...pathParams, ...queryParams];
      const status = String(op.status ?? 200);
      const content = op.produces
        ? { [op.produces]: { schema: { type: 'string' } } }
        : { 'application/json': { schema: op.response ? ref(op.response, 'output') : GENERIC_OBJECT } };
      item[method] = {
        summary: op.summary,
        ...(op.public ? { security: [] } : {}),
        operationId: `${method}${path.replace(/[^A-Za-z0-9]+(.)?/g, (_m, c: string | undefined) => (c ? c.toUpperCase() : ''))}`,
        ...(parameters.length ? { parameters } : {}),
        ...(op.body ? { requestBody: { required: true, content: { 'application/json': { schema: ref(op.body, 'input') } } } } : {}),
        ...(op.form ? { requestBody: { required: true, content: { 'multipart/form-data': { schema: formSchema(ref(op.form, 'input')) } } } } : {}),
        responses: {
          [status]: { description: 'Success', content },
          default: { description: 'An error', content: { 'application/json': { schema: { $ref: '#/components/schemas/ApiError' } } } },
        },
      };
    }
    paths[path] = item;
  }

  return {
    openapi: '3.1.0',
    jsonSchemaDialect: 'https://json-schema.org/draft/2020-12/schema',
    info: {
      title: 'Sluice API',
      version: '1',
      description:
        'Characterize, bin and match JFETs. JSON in snake_case with SI units in the names (idss_a, vp_v). People sign in with a session cookie (/api/auth/); test stations send `Authorization: Bearer <station token>`. Every error is { "error": { "code", "message" } }.',
    },
    servers: [{ url: '/' }],
    security: [{ session: [] }, { station: [] }],
    paths,
    components: {
      schemas: components,
      securitySchemes: {
        session: { type: 'apiKey', in: 'cookie', name: 'better-auth.session_token', description: 'The session cookie set by signing in at /api/auth/sign-in/email.' },
        station: { type: 'http', scheme: 'bearer', description: 'A test-station token issued under Admin → Stations.' },
      },
    },
  };
}
