import { createHash, randomBytes } from 'node:crypto';
import { ApiRateBucket, ApiToken, Organisation, getDb, serializeOn } from '../db';
import type { SessionUser } from '../auth/lucia';
import { config } from '../config';
import type { ApiTokenNameInput } from '../../validation/api-tokens';
import { ForbiddenError, NotFoundError, RateLimitedError, UnauthorizedError } from './errors';
import { recordAudit } from './audit';

/** Someone calling the API: a signed-in person, or a fleet's token acting for that fleet. */
export type ApiUser = SessionUser & { apiTokenId: number | null };

/** Tokens start with this, so a leaked one is recognisable in logs and secret scanners. */
export const TOKEN_PREFIX = 'sct_';
const PREFIX_LENGTH = 12;

export const hashApiToken = (token: string) => createHash('sha256').update(token).digest('hex');

export interface ApiTokenView {
	id: number;
	name: string;
	prefix: string;
	createdAt: string;
	lastUsedAt: string | null;
	revokedAt: string | null;
}

function view(t: ApiToken): ApiTokenView {
	return {
		id: t.id,
		name: t.name,
		prefix: t.prefix,
		createdAt: new Date(t.createdAt).toISOString(),
		lastUsedAt: t.lastUsedAt ? new Date(t.lastUsedAt).toISOString() : null,
		revokedAt: t.revokedAt ? new Date(t.revokedAt).toISOString() : null
	};
}

function assertFleetManager(user: SessionUser): void {
	if (user.role !== 'fleet_manager')
		throw new ForbiddenError('Only a fleet manager looks after API tokens.');
}

export async function listApiTokens(user: SessionUser): Promise<ApiTokenView[]> {
	assertFleetManager(user);
	const rows = await ApiToken.findAll({
		where: { organisationId: user.organisationId },
		order: [['id', 'DESC']]
	});
	return rows.map(view);
}

/** A new token for the fleet. The token itself is returned this once; only its hash is kept. */
export async function createApiToken(
	user: SessionUser,
	input: ApiTokenNameInput,
	now = new Date()
) {
	assertFleetManager(user);
	const token = TOKEN_PREFIX + randomBytes(32).toString('base64url');
	const row = await getDb().transaction(async () => {
		const created = await ApiToken.create({
			organisationId: user.organisationId,
			name: input.name,
			tokenHash: hashApiToken(token),
			prefix: token.slice(0, PREFIX_LENGTH),
			createdById: user.id,
			createdAt: now,
			updatedAt: now
		});
		await recordAudit(user, 'api_token.create', 'api_token', created.id, { name: input.name }, now);
		return created;
	});
	return { token, apiToken: view(row) };
}

export async function revokeApiToken(
	user: SessionUser,
	tokenId: number,
	now = new Date()
): Promise<ApiTokenView> {
	assertFleetManager(user);
	return getDb().transaction(async () => {
		const row = await ApiToken.findOne({
			where: { id: tokenId, organisationId: user.organisationId }
		});
		if (!row) throw new NotFoundError('That token');
		if (!row.revokedAt) {
			await row.update({ revokedAt: now });
			await recordAudit(user, 'api_token.revoke', 'api_token', row.id, { name: row.name }, now);
		}
		return view(row);
	});
}

/**
 * The caller behind a bearer token, acting as a fleet manager of the token's fleet. Each use
 * spends one request from the token's bucket (refilled at API_RATE_PER_MINUTE, holding at most
 * API_RATE_BURST) and stamps the last-used time, in one transaction so instances agree.
 * @throws UnauthorizedError for an unknown or revoked token, RateLimitedError when spent
 */
export async function authenticateApiToken(token: string, now = new Date()): Promise<ApiUser> {
	const row = await ApiToken.findOne({ where: { tokenHash: hashApiToken(token) } });
	if (!row || row.revokedAt)
		throw new UnauthorizedError('This API token is not valid: it is unknown or has been revoked.');
	await getDb().transaction(async () => {
		await serializeOn(getDb(), `api-rate:${row.id}`);
		const capacity = config.API_RATE_BURST;
		const perSecond = config.API_RATE_PER_MINUTE / 60;
		const bucket = await ApiRateBucket.findByPk(row.id);
		// `now` was read before this request queued for the lock, so a twin that queued later may
		// already have refilled up to a later time: the bucket's clock only moves forward, or the
		// same seconds would be refilled twice.
		const refilledAt = bucket
			? new Date(Math.max(now.getTime(), new Date(bucket.refilledAt).getTime()))
			: now;
		const elapsedS = bucket
			? (refilledAt.getTime() - new Date(bucket.refilledAt).getTime()) / 1000
			: 0;
		const available = bucket ? Math.min(capacity, bucket.tokens + elapsedS * perSecond) : capacity;
		if (available < 1)
			throw new RateLimitedError(Math.max(1, Math.ceil((1 - available) / perSecond)));
		if (bucket) await bucket.update({ tokens: available - 1, refilledAt });
		else await ApiRateBucket.create({ apiTokenId: row.id, tokens: available - 1, refilledAt });
		await ApiToken.update({ lastUsedAt: now }, { where: { id: row.id } });
	});
	const organisation = await Organisation.findByPk(row.organisationId, {
		attributes: ['timeZone']
	});
	return {
		id: row.createdById,
		email: '',
		name: `API token “${row.name}”`,
		role: 'fleet_manager',
		organisationId: row.organisationId,
		unitPreference: 'mbar',
		locale: 'en-GB',
		timeZone: organisation?.timeZone ?? 'Europe/London',
		apiTokenId: row.id
	};
}
