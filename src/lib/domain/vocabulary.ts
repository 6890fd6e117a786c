/**
 * The words Sootcast stores. Kept in the domain so forms, services, the engine and the API
 * share one list.
 */
export const ROLES = ['admin', 'fleet_manager', 'workshop', 'driver'] as const;
export type Role = (typeof ROLES)[number];

export const ORGANISATION_KINDS = ['fleet', 'workshop', 'platform'] as const;
export type OrganisationKind = (typeof ORGANISATION_KINDS)[number];

export const PRESSURE_UNITS = ['mbar', 'hPa', 'kPa', 'psi', 'inHg', 'inH2O'] as const;
export type PressureUnitCode = (typeof PRESSURE_UNITS)[number];

/** How the engine was running when a reading was taken; Δp is only comparable within one. */
export const TEST_CONDITIONS = ['idle', 'raised_idle', 'road_load', 'telemetry'] as const;
export type TestCondition = (typeof TEST_CONDITIONS)[number];

export const READING_SOURCES = ['manual', 'import', 'api', 'capture', 'visit', 'demo'] as const;
export type ReadingSource = (typeof READING_SOURCES)[number];

export const EVENT_KINDS = [
	'regen_passive',
	'regen_active',
	'regen_service',
	'regen_interrupted',
	'filter_cleaning',
	'filter_replacement',
	'sensor_repair'
] as const;
export type EventKind = (typeof EVENT_KINDS)[number];

export const FUELS = ['en590_diesel', 'biodiesel_blend', 'paraffinic_en15940'] as const;
export type Fuel = (typeof FUELS)[number];

export const OUTBOX_STATES = ['pending', 'sent', 'failed'] as const;
export const BOOKING_STATES = [
	'requested',
	'confirmed',
	'proposed',
	'declined',
	'cancelled',
	'done'
] as const;
export type BookingState = (typeof BOOKING_STATES)[number];
