/**
 * The telemetry API's request bodies. These schemas are the contract: the OpenAPI document at
 * /api/v1/openapi.json is generated from them (src/lib/server/http/openapi.ts).
 */
import { z } from 'zod';
import { EVENT_KINDS, TEST_CONDITIONS } from '../domain/vocabulary';

/** Most readings or events in one request. */
export const MAX_BATCH_ITEMS = 1000;

const hexBytes = (count: string) =>
	z
		.string()
		.max(64)
		.regex(
			/^(?:[0-9a-fA-F]{2}[\s:-]?)+$/,
			'Give the bytes as hexadecimal pairs, e.g. "41 7A 01 01 2C 00 00 00 00"'
		)
		.meta({
			description: `${count} as hexadecimal pairs; spaces, colons or dashes between them are allowed`
		});

export const deltaPSchema = z
	.discriminatedUnion('format', [
		z.object({
			format: z.literal('mbar'),
			value: z.number().min(-1000).max(100000).meta({ description: 'Δp in millibar' })
		}),
		z.object({
			format: z.literal('kPa'),
			value: z.number().min(-100).max(10000).meta({ description: 'Δp in kilopascal' })
		}),
		z.object({
			format: z.literal('psi'),
			value: z.number().min(-15).max(1500).meta({ description: 'Δp in pounds per square inch' })
		}),
		z.object({
			format: z.literal('j1939_spn3251'),
			raw: z.number().int().min(0).max(65535).meta({
				description:
					'SAE J1939 SPN 3251 raw count (0.1 kPa per bit, offset 0); values above 0xFAFF (64255) are refused'
			})
		}),
		z.object({
			format: z.literal('j1939_pgn64946'),
			data: hexBytes(
				'The 8 data bytes of PGN 64946 (AT1IMG); SPN 3251 is read from bytes 5–6, little-endian'
			)
		}),
		z.object({
			format: z.literal('obd_pid_7a'),
			data: hexBytes(
				'The answer to OBD-II service 01 PID 7A: the 7 data bytes A–G, with or without the leading 41 7A'
			)
		})
	])
	.meta({
		description: 'The differential pressure across the filter, in one of the accepted encodings'
	});
export type DeltaPInput = z.infer<typeof deltaPSchema>;

const vehicleRef = {
	vehicleId: z.number().int().positive().optional().meta({ description: 'Sootcast id of the van' }),
	registration: z
		.string()
		.trim()
		.min(1)
		.max(16)
		.optional()
		.meta({ description: 'Registration of the van (instead of vehicleId)' })
};
const oneVehicle = (v: { vehicleId?: number; registration?: string }) =>
	(v.vehicleId === undefined) !== (v.registration === undefined);
const oneVehicleMessage = {
	message: 'Give either vehicleId or registration (one of the two)',
	path: ['vehicleId']
};

const timestamp = (what: string) =>
	z.iso.datetime({
		offset: true,
		error: `${what} must be an ISO 8601 date-time with a zone, e.g. 2025-03-01T08:30:00Z`
	});

export const readingSchema = z
	.object({
		clientReadingId: z.string().trim().min(1).max(80).optional().meta({
			description:
				"The sender's own id for this reading; a reading whose id is already stored for the van is not stored again"
		}),
		...vehicleRef,
		takenAt: timestamp('takenAt').meta({
			description: 'When the reading was taken (not in the future)'
		}),
		condition: z
			.enum(TEST_CONDITIONS)
			.default('telemetry')
			.meta({ description: 'How the engine was running' }),
		deltaP: deltaPSchema,
		odometerKm: z.number().min(0, 'odometerKm must be 0 or more').max(3_000_000).optional(),
		rpm: z.number().int().min(0).max(8000).optional(),
		airMassFlowKgH: z.number().min(0).max(5000).optional(),
		exhaustTempC: z.number().min(-60).max(1200).optional(),
		ambientPressureKpa: z.number().min(30).max(120).optional()
	})
	.strict()
	.refine(oneVehicle, oneVehicleMessage);
export type ReadingInput = z.infer<typeof readingSchema>;

export const readingsBatchSchema = z
	.object({
		readings: z
			.array(readingSchema)
			.min(1, 'Send at least one reading')
			.max(MAX_BATCH_ITEMS, `Send at most ${MAX_BATCH_ITEMS} readings per request`)
	})
	.strict();
export type ReadingsBatchInput = z.infer<typeof readingsBatchSchema>;

export const eventSchema = z
	.object({
		clientEventId: z.string().trim().min(1).max(80).optional().meta({
			description:
				"The sender's own id for this event; an event whose id is already stored for the van is not stored again"
		}),
		...vehicleRef,
		occurredAt: timestamp('occurredAt').meta({
			description: 'When it happened (not in the future)'
		}),
		kind: z.enum(EVENT_KINDS),
		odometerKm: z.number().min(0, 'odometerKm must be 0 or more').max(3_000_000).optional(),
		notes: z.string().max(2000).optional()
	})
	.strict()
	.refine(oneVehicle, oneVehicleMessage);
export type EventInput = z.infer<typeof eventSchema>;

export const eventsBatchSchema = z
	.object({
		events: z
			.array(eventSchema)
			.min(1, 'Send at least one event')
			.max(MAX_BATCH_ITEMS, `Send at most ${MAX_BATCH_ITEMS} events per request`)
	})
	.strict();
export type EventsBatchInput = z.infer<typeof eventsBatchSchema>;

/** What a batch request answers. */
export const batchResultSchema = z.object({
	batchId: z
		.number()
		.int()
		.nullable()
		.meta({ description: 'The import batch holding what was stored (null when nothing was)' }),
	stored: z.number().int(),
	duplicates: z.array(
		z.object({
			index: z.number().int().meta({ description: 'Position in the request array' }),
			reason: z.string()
		})
	)
});
export type BatchResult = z.infer<typeof batchResultSchema>;

export const idempotencyKeySchema = z
	.string()
	.min(1)
	.max(200)
	.regex(/^[\x21-\x7e]+$/, 'Idempotency-Key must be 1 to 200 visible ASCII characters');
