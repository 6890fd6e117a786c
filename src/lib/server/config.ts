import { z } from 'zod';

// process.env is read once, here, and nowhere else on the server.
const envSchema = z
	.object({
		NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
		DATABASE_URL: z.string().min(1).default('sqlite:data/sootcast.db'),
		PORT: z.coerce.number().int().min(1).max(65535).default(3000),
		HOST: z.string().default('0.0.0.0'),
		ORIGIN: z.string().url().optional(),
		PUBLIC_URL: z.string().url().optional(),
		/** Secure cookies; defaults to on when the public URL is https. */
		COOKIE_SECURE: z
			.enum(['true', 'false'])
			.optional()
			.transform((v) => (v === undefined ? undefined : v === 'true')),
		SMTP_URL: z.string().optional(),
		MAIL_FROM: z.string().default('Sootcast <no-reply@sootcast.test>'),
		MAIL_SINK_DIR: z.string().default('data/mailbox'),
		/** Set by `npm start` for the web server only while the local sink is the transport. */
		DEV_MAILBOX_DIR: z.string().optional(),
		/** Signs unsubscribe links; must be the same on every instance. Generated under data/ when unset. */
		APP_SECRET: z.string().min(32, 'APP_SECRET must be at least 32 characters').optional(),
		MAIL_SINK_PORT: z.coerce.number().int().min(0).max(65535).default(2525),
		TZ_DEFAULT: z.string().default('Europe/London'),
		SIGNIN_MAX_FAILURES: z.coerce.number().int().min(1).default(5),
		SIGNIN_LOCK_MINUTES: z.coerce.number().int().min(1).default(15),
		SIGNIN_MAX_FAILURES_PER_ADDRESS: z.coerce.number().int().min(1).default(30),
		/** Expected crossing within this many days: 'crossing soon'; within the second: 'keep an eye on it'. */
		FORECAST_SOON_DAYS: z.coerce.number().int().min(1).max(365).default(30),
		FORECAST_WATCH_DAYS: z.coerce.number().int().min(1).max(730).default(90),
		/** Where uploaded files (CSV imports, captures) are kept: the local storage folder. */
		STORAGE_DIR: z.string().min(1).default('data/uploads'),
		/** Largest CSV import file, bytes (default 20 MB), and most data rows in one import. */
		IMPORT_MAX_BYTES: z.coerce
			.number()
			.int()
			.min(1024)
			.default(20 * 1024 * 1024),
		IMPORT_MAX_ROWS: z.coerce.number().int().min(1).default(200_000),
		/** Largest voltage capture, bytes (default 256 MB, about 12 million samples). */
		CAPTURE_MAX_BYTES: z.coerce
			.number()
			.int()
			.min(1024)
			.default(256 * 1024 * 1024),
		/** Largest JSON body the API reads, bytes (default 1 MB). */
		API_MAX_BODY_BYTES: z.coerce
			.number()
			.int()
			.min(1024)
			.default(1024 * 1024),
		/** Per-token rate limit: sustained requests per minute and the burst allowed on top. */
		API_RATE_PER_MINUTE: z.coerce.number().min(1).default(120),
		API_RATE_BURST: z.coerce.number().int().min(1).default(60),
		SEED_DEMO: z
			.enum(['true', 'false'])
			.default('true')
			.transform((v) => v === 'true'),
		LOG_SQL: z
			.enum(['true', 'false'])
			.default('false')
			.transform((v) => v === 'true')
	})
	.superRefine((env, ctx) => {
		// Several instances share a PostgreSQL database; a secret generated per machine would make
		// a link signed by one instance fail on the next.
		if (/^postgres(ql)?:\/\//.test(env.DATABASE_URL) && !env.APP_SECRET)
			ctx.addIssue({
				code: 'custom',
				path: ['APP_SECRET'],
				message:
					'set APP_SECRET (32+ characters, the same on every instance) when DATABASE_URL is PostgreSQL'
			});
	});

export type Config = z.infer<typeof envSchema>;

function loadConfig(): Config {
	const parsed = envSchema.safeParse(process.env);
	if (!parsed.success) {
		const lines = parsed.error.issues.map((i) => `  ${i.path.join('.')}: ${i.message}`);
		throw new Error(`Invalid environment configuration:\n${lines.join('\n')}`);
	}
	return parsed.data;
}

export const config: Config = loadConfig();

export const publicUrl = (): string =>
	config.PUBLIC_URL ?? config.ORIGIN ?? `http://localhost:${config.PORT}`;

export const isSecureCookie = (): boolean =>
	config.COOKIE_SECURE ?? publicUrl().startsWith('https://');
