/** What a CSV import can hold and the settings the mapping step produces. */
import { z } from 'zod';
import { TEST_CONDITIONS } from '../domain/vocabulary';

export const IMPORT_KINDS = ['readings', 'trips', 'vehicles'] as const;
export type ImportKind = (typeof IMPORT_KINDS)[number];

export const IMPORT_KIND_LABEL: Record<ImportKind, string> = {
	readings: 'Δp readings',
	trips: 'Trips',
	vehicles: 'Vans'
};

/** Units a Δp column may hold; volts go through a sensor type's transfer function. */
export const IMPORT_UNITS = ['mbar', 'kPa', 'psi', 'volts'] as const;
export type ImportUnit = (typeof IMPORT_UNITS)[number];

export const DATE_FORMATS = ['iso', 'dmy', 'mdy'] as const;
export type DateFormat = (typeof DATE_FORMATS)[number];
export const DATE_FORMAT_LABEL: Record<DateFormat, string> = {
	iso: 'Year first: 2025-03-14 08:30',
	dmy: 'Day first: 14/03/2025 08:30',
	mdy: 'Month first: 03/14/2025 08:30'
};

export interface ImportField {
	key: string;
	label: string;
	required: boolean;
	/** Header names (lower case, letters and digits only) that suggest this field. */
	hints: string[];
	help: string;
}

export const IMPORT_FIELDS: Record<ImportKind, ImportField[]> = {
	readings: [
		{
			key: 'registration',
			label: 'Van registration',
			required: true,
			hints: [
				'registration',
				'reg',
				'regno',
				'van',
				'vehicle',
				'plate',
				'vrm',
				'numberplate',
				'kennzeichen',
				'immatriculation',
				'matricula'
			],
			help: 'e.g. LKD 401'
		},
		{
			key: 'takenAt',
			label: 'Date and time',
			required: true,
			hints: [
				'takenat',
				'time',
				'date',
				'datetime',
				'timestamp',
				'when',
				'measuredat',
				'readingtime'
			],
			help: 'when the reading was taken'
		},
		{
			key: 'deltaP',
			label: 'Δp',
			required: true,
			hints: [
				'dp',
				'deltap',
				'δp',
				'dpmbar',
				'dpkpa',
				'dppsi',
				'pressure',
				'backpressure',
				'differentialpressure',
				'dpfpressure',
				'dpfdp',
				'signal',
				'volts',
				'voltage'
			],
			help: 'the differential pressure (or signal voltage)'
		},
		{
			key: 'condition',
			label: 'Test condition',
			required: false,
			hints: ['condition', 'testcondition', 'mode', 'state'],
			help: 'idle, raised idle, road load or telemetry'
		},
		{
			key: 'odometerKm',
			label: 'Odometer (km)',
			required: false,
			hints: ['odometer', 'odometerkm', 'odo', 'km', 'mileage', 'distance'],
			help: 'kilometres on the clock'
		},
		{
			key: 'rpm',
			label: 'Engine speed (rpm)',
			required: false,
			hints: ['rpm', 'enginespeed', 'revs'],
			help: ''
		}
	],
	trips: [
		{
			key: 'registration',
			label: 'Van registration',
			required: true,
			hints: ['registration', 'reg', 'regno', 'van', 'vehicle', 'plate', 'vrm'],
			help: 'e.g. LKD 401'
		},
		{
			key: 'startedAt',
			label: 'Start',
			required: true,
			hints: ['startedat', 'start', 'starttime', 'departure', 'from'],
			help: 'date and time the trip began'
		},
		{
			key: 'endedAt',
			label: 'End',
			required: true,
			hints: ['endedat', 'end', 'endtime', 'arrival', 'to', 'finish'],
			help: 'date and time the trip ended'
		},
		{
			key: 'distanceKm',
			label: 'Distance (km)',
			required: true,
			hints: ['distancekm', 'distance', 'km', 'length'],
			help: ''
		},
		{
			key: 'idleMinutes',
			label: 'Idle (minutes)',
			required: false,
			hints: ['idleminutes', 'idle', 'idlemin', 'idletime'],
			help: ''
		},
		{
			key: 'meanSpeedKmh',
			label: 'Mean speed (km/h)',
			required: false,
			hints: ['meanspeedkmh', 'meanspeed', 'avgspeed', 'averagespeed', 'speed'],
			help: ''
		}
	],
	vehicles: [
		{
			key: 'registration',
			label: 'Registration',
			required: true,
			hints: ['registration', 'reg', 'regno', 'plate', 'vrm', 'van'],
			help: ''
		},
		{
			key: 'makeModel',
			label: 'Make and model',
			required: false,
			hints: ['makemodel', 'model', 'make', 'vehicletype', 'type'],
			help: ''
		},
		{
			key: 'vin',
			label: 'VIN',
			required: false,
			hints: ['vin', 'chassis', 'chassisnumber'],
			help: '17 characters'
		},
		{
			key: 'emissionClass',
			label: 'Emission class',
			required: false,
			hints: ['emissionclass', 'euro', 'eurostandard', 'emissions'],
			help: 'e.g. Euro 6d'
		},
		{
			key: 'fuel',
			label: 'Fuel',
			required: false,
			hints: ['fuel', 'fueltype'],
			help: 'diesel, biodiesel blend or HVO/paraffinic'
		},
		{
			key: 'oilGrade',
			label: 'Oil grade',
			required: false,
			hints: ['oilgrade', 'oil', 'engineoil'],
			help: ''
		},
		{
			key: 'engineDisplacementCc',
			label: 'Engine size (cc)',
			required: false,
			hints: ['enginedisplacementcc', 'enginecc', 'cc', 'displacement', 'enginesize'],
			help: ''
		},
		{
			key: 'depot',
			label: 'Depot',
			required: false,
			hints: ['depot', 'base', 'site', 'location'],
			help: 'the name of one of your depots'
		}
	]
};

const optionalId = z.preprocess(
	(v) => (v === '' || v === undefined || v === null ? undefined : Number(v)),
	z.number({ error: 'Choose from the list' }).int().positive().optional()
);

/** The mapping step's result: which file column feeds each field, and how to read values. */
export const importSettingsSchema = z
	.object({
		kind: z.enum(IMPORT_KINDS, { error: 'Choose what the file holds' }),
		/** Field key → header name in the file ('' or absent: not in the file). */
		columns: z.record(z.string(), z.string().max(200)).optional(),
		unit: z.enum(IMPORT_UNITS, { error: 'Choose the unit of the Δp column' }).default('mbar'),
		sensorTypeId: optionalId,
		dateFormat: z.enum(DATE_FORMATS, { error: 'Choose how dates are written' }).default('iso'),
		condition: z.enum(TEST_CONDITIONS, { error: 'Choose the test condition' }).default('idle'),
		fleetId: optionalId
	})
	.refine((s) => s.kind !== 'readings' || s.unit !== 'volts' || s.sensorTypeId !== undefined, {
		message: 'Choose the sensor type that turns volts into Δp',
		path: ['sensorTypeId']
	});
export type ImportSettingsInput = z.infer<typeof importSettingsSchema>;

/** Turns the mapping form (`col.<field>`, unit, …) into the settings object. */
export function settingsFromForm(raw: Record<string, string>): Record<string, unknown> {
	const columns: Record<string, string> = {};
	for (const [key, value] of Object.entries(raw))
		if (key.startsWith('col.')) columns[key.slice(4)] = value;
	return {
		kind: raw.kind,
		columns,
		unit: raw.unit || undefined,
		sensorTypeId: raw.sensorTypeId,
		dateFormat: raw.dateFormat || undefined,
		condition: raw.condition || undefined,
		fleetId: raw.fleetId
	};
}

export const stageQuerySchema = z.object({
	kind: z.enum(IMPORT_KINDS, { error: 'kind must be readings, trips or vehicles' }),
	fileName: z.string().trim().min(1).max(255).default('import.csv')
});

export const importKindQuerySchema = z.object({
	kind: z.enum(IMPORT_KINDS).catch('readings')
});
