import { Umzug, SequelizeStorage } from 'umzug';
import type { QueryInterface, Sequelize } from 'sequelize';
import * as m0001 from './migrations/0001-initial-schema';
import * as m0002 from './migrations/0002-action-tokens';
import * as m0003 from './migrations/0003-imports-api-captures';
import * as m0004 from './migrations/0004-vehicle-statuses';
import * as m0005 from './migrations/0005-workshop-capacity-bookings';
import * as m0006 from './migrations/0006-visit-report-attachments';

// An explicit list, not a folder glob: a glob does not survive bundling into the server build.
const migrations = [
	{ name: '0001-initial-schema', ...m0001 },
	{ name: '0002-action-tokens', ...m0002 },
	{ name: '0003-imports-api-captures', ...m0003 },
	{ name: '0004-vehicle-statuses', ...m0004 },
	{ name: '0005-workshop-capacity-bookings', ...m0005 },
	{ name: '0006-visit-report-attachments', ...m0006 }
];

export function createMigrator(sequelize: Sequelize) {
	return new Umzug<QueryInterface>({
		migrations: migrations.map(({ name, up, down }) => ({
			name,
			up: ({ context }) => up({ context }),
			down: ({ context }) => down({ context })
		})),
		context: sequelize.getQueryInterface(),
		storage: new SequelizeStorage({ sequelize, tableName: 'schema_migrations' }),
		logger: undefined
	});
}
