/**
 * The OpenAPI 3.1 description of /api/v1, generated from the same zod schemas the routes
 * validate with (zod's JSON Schema output is draft 2020-12, the dialect of OpenAPI 3.1), so the
 * document cannot drift from the checks. tests/integration/openapi.test.ts keeps the list of
 * paths in step with the route files.
 */
import { z } from 'zod';
import {
	batchResultSchema,
	eventsBatchSchema,
	readingsBatchSchema
} from '../../validation/telemetry';
import { importSettingsSchema, stageQuerySchema } from '../../validation/imports';
import { captureQuerySchema, traceQuerySchema } from '../../validation/sensor-tests';
import { listQuerySchema } from '../../validation/vehicle';
import { boardPageSchema, boardQuerySchema } from '../../validation/board';

const schema = (s: z.ZodType, io: 'input' | 'output' = 'input') => {
	const { $schema: _dialect, ...rest } = z.toJSONSchema(s, {
		io,
		unrepresentable: 'any'
	}) as Record<string, unknown>;
	return rest;
};

/** Query parameters from an object schema. */
function queryParameters(s: z.ZodObject): Record<string, unknown>[] {
	const json = schema(s) as { properties?: Record<string, unknown>; required?: string[] };
	return Object.entries(json.properties ?? {}).map(([name, value]) => ({
		name,
		in: 'query',
		required: (json.required ?? []).includes(name) && !(value as { default?: unknown }).default,
		schema: value
	}));
}

const errorBody = {
	type: 'object',
	required: ['error'],
	properties: {
		error: {
			type: 'object',
			required: ['code', 'message'],
			properties: {
				code: { type: 'string' },
				message: { type: 'string' },
				fields: { type: 'object', additionalProperties: { type: 'string' } },
				issues: {
					type: 'array',
					items: {
						type: 'object',
						properties: {
							path: { type: 'array' },
							code: { type: 'string' },
							message: { type: 'string' }
						}
					}
				},
				problems: {
					type: 'array',
					items: {
						type: 'object',
						properties: {
							line: { type: 'integer' },
							column: { type: 'integer' },
							columnName: { type: 'string' },
							message: { type: 'string' }
						}
					}
				}
			}
		}
	}
};
const err = (description: string) => ({
	description,
	content: { 'application/json': { schema: { $ref: '#/components/schemas/Error' } } }
});
const common = {
	'401': err('No session and no valid token, or the token is revoked'),
	'403': err('Your role may not use this endpoint'),
	'429': {
		...err('The token has spent its request allowance'),
		headers: { 'Retry-After': { schema: { type: 'integer' }, description: 'Seconds to wait' } }
	}
};
const idParam = (name: string) => ({
	name,
	in: 'path',
	required: true,
	schema: { type: 'integer', minimum: 1 }
});
const ok = (description: string, body?: unknown) => ({
	description,
	...(body ? { content: { 'application/json': { schema: body } } } : {})
});
const idempotencyHeader = {
	name: 'Idempotency-Key',
	in: 'header',
	required: false,
	description:
		'Any unique string (1–200 visible ASCII characters). Repeating a request with the same key and body replays the first answer and stores nothing again.',
	schema: { type: 'string', minLength: 1, maxLength: 200 }
};

export function openApiDocument(serverUrl: string) {
	return {
		openapi: '3.1.0',
		info: {
			title: 'Sootcast API',
			version: '1.0.0',
			description:
				'Readings, filter events, CSV imports and sensor captures for Sootcast. Authenticate with a fleet API token (`Authorization: Bearer sct_…`, created in Fleet settings) or a signed-in session. Errors have the shape `{ "error": { "code", "message", "fields"?, "issues"? } }`.'
		},
		servers: [{ url: serverUrl }],
		security: [{ bearer: [] }, { session: [] }],
		components: {
			securitySchemes: {
				bearer: {
					type: 'http',
					scheme: 'bearer',
					description: 'A fleet API token; acts as a fleet manager of that fleet.'
				},
				session: { type: 'apiKey', in: 'cookie', name: 'sootcast_session' }
			},
			schemas: {
				Error: errorBody,
				ReadingsBatch: schema(readingsBatchSchema),
				EventsBatch: schema(eventsBatchSchema),
				BatchResult: schema(batchResultSchema, 'output'),
				ImportSettings: schema(importSettingsSchema),
				BoardPage: schema(boardPageSchema, 'output')
			}
		},
		paths: {
			'/api/v1/readings': {
				post: {
					summary:
						'Store a batch of Δp readings (mbar, kPa, psi, SAE J1939 SPN 3251, OBD-II PID 7A)',
					parameters: [idempotencyHeader],
					requestBody: {
						required: true,
						content: {
							'application/json': { schema: { $ref: '#/components/schemas/ReadingsBatch' } }
						}
					},
					responses: {
						'201': ok('Stored; duplicates are listed, not stored', {
							$ref: '#/components/schemas/BatchResult'
						}),
						'200': ok('Nothing new: every reading was already stored', {
							$ref: '#/components/schemas/BatchResult'
						}),
						'400': err(
							'Malformed JSON (code invalid_json) or a schema mismatch (code invalid, with the zod issues)'
						),
						'404': err('A van that does not exist or belongs to another fleet'),
						'409': err('The Idempotency-Key was used for a different body'),
						'413': err('The body is larger than the API accepts'),
						...common
					}
				}
			},
			'/api/v1/events': {
				post: {
					summary: 'Store a batch of filter events (regenerations, cleaning, replacement, repairs)',
					parameters: [idempotencyHeader],
					requestBody: {
						required: true,
						content: {
							'application/json': { schema: { $ref: '#/components/schemas/EventsBatch' } }
						}
					},
					responses: {
						'201': ok('Stored', { $ref: '#/components/schemas/BatchResult' }),
						'200': ok('Nothing new', { $ref: '#/components/schemas/BatchResult' }),
						'400': err('Malformed JSON or a schema mismatch'),
						'404': err('A van outside your reach'),
						'409': err('Idempotency-Key reused for a different body'),
						'413': err('Body too large'),
						...common
					}
				}
			},
			'/api/v1/vehicles': {
				get: {
					summary: 'The vans you may see',
					parameters: queryParameters(listQuerySchema),
					responses: { '200': ok('One page of vans'), ...common }
				}
			},
			'/api/v1/board': {
				get: {
					summary:
						"One page of the risk board: each van's forecast, its standing visit and the suggested visit date",
					parameters: queryParameters(boardQuerySchema),
					responses: {
						'200': ok('One page of vans', { $ref: '#/components/schemas/BoardPage' }),
						...common
					}
				}
			},
			'/api/v1/vehicles/{vehicleId}': {
				get: {
					summary: "One van's story",
					parameters: [idParam('vehicleId')],
					responses: { '200': ok('The van'), '404': err('Not found'), ...common }
				}
			},
			'/api/v1/vehicles/{vehicleId}/captures': {
				post: {
					summary:
						'Upload a static-test voltage capture (CSV body, streamed) and analyse it (workshops)',
					parameters: [idParam('vehicleId'), ...queryParameters(captureQuerySchema)],
					requestBody: { required: true, content: { 'text/csv': { schema: { type: 'string' } } } },
					responses: {
						'201': ok('The new sensor test: { testId, verdict }'),
						'400': err('The capture cannot be read (line and column named)'),
						'404': err('Not found'),
						'413': err('File too large'),
						...common
					}
				}
			},
			'/api/v1/sensor-tests/{testId}/trace': {
				get: {
					summary: "Min/max buckets of a static test's capture for a time range (chart data)",
					parameters: [idParam('testId'), ...queryParameters(traceQuerySchema)],
					responses: {
						'200': ok('Buckets with min, mean and max volts'),
						'400': err('Bad range'),
						'404': err('Not found'),
						...common
					}
				}
			},
			'/api/v1/uploads/{uploadId}': {
				get: {
					summary: 'Download a stored file',
					parameters: [idParam('uploadId')],
					responses: {
						'200': { description: 'The file' },
						'404': err('Not found or not yours'),
						...common
					}
				}
			},
			'/api/v1/visit-reports/{reportId}/attachments/{attachmentId}': {
				get: {
					summary: "A visit report's photo or PDF, inline, with the type found by content sniffing",
					parameters: [idParam('reportId'), idParam('attachmentId')],
					responses: {
						'200': {
							description: 'The file (image/jpeg, image/png, image/webp or application/pdf)'
						},
						'304': { description: 'Unchanged since the ETag sent in If-None-Match' },
						'404': err('Not found, or not the fleet of the van nor the workshop that wrote it'),
						...common
					}
				}
			},
			'/api/v1/imports': {
				post: {
					summary:
						'Upload a CSV file for import (raw body) and get its layout and a suggested column mapping',
					parameters: queryParameters(stageQuerySchema),
					requestBody: { required: true, content: { 'text/csv': { schema: { type: 'string' } } } },
					responses: {
						'201': ok('Stored; header, first rows and suggested settings'),
						'400': err('Empty or not a text file'),
						'413': err('File too large'),
						...common
					}
				},
				get: {
					summary: 'Imports and API batches of your organisation, newest first',
					responses: { '200': ok('The batches'), ...common }
				}
			},
			'/api/v1/imports/{uploadId}': {
				post: {
					summary:
						'Check and import an uploaded file (all rows or none); `preview: true` checks the first rows only',
					description:
						'With `Accept: application/x-ndjson` the answer streams progress lines, then a `done` or `error` line.',
					parameters: [idParam('uploadId')],
					requestBody: {
						required: true,
						content: {
							'application/json': {
								schema: {
									allOf: [
										{ $ref: '#/components/schemas/ImportSettings' },
										{ type: 'object', properties: { preview: { type: 'boolean' } } }
									]
								}
							}
						}
					},
					responses: {
						'201': ok('Imported: batch id, rows stored, duplicates'),
						'400': err('Problems with line and column (code import_invalid)'),
						'404': err('Not found'),
						...common
					}
				}
			},
			'/api/v1/import-batches/{batchId}': {
				delete: {
					summary: 'Undo an import or API batch',
					parameters: [idParam('batchId')],
					responses: {
						'200': ok('The batch, now undone'),
						'400': err('Already undone'),
						'404': err('Not found'),
						...common
					}
				}
			},
			'/api/v1/openapi.json': {
				get: { summary: 'This document', security: [], responses: { '200': ok('OpenAPI 3.1') } }
			}
		}
	};
}
