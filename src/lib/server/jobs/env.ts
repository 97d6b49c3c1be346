// startJobs options from the app's environment, for hooks.server.ts:
//   export const init = async () => { await startJobs(jobsOptionsFromEnv()); };
import { env } from '$env/dynamic/private';
import { mailConfigFromEnv } from '../mail/env';
import { describeRecheckCounts, recheckOpenOrders } from '../shipping/order-checks';
import { forecastSource } from '../weather';
import type { JobsOptions } from '.';

/** DATABASE_URL, SMTP_URL and MAIL_FROM; the daily ship re-check with the app's forecast source. */
export function jobsOptionsFromEnv(): JobsOptions {
	const connectionString = env.DATABASE_URL;
	if (!connectionString) throw new Error('DATABASE_URL is not set; copy .env.example to .env');
	return {
		connectionString,
		...mailConfigFromEnv(),
		shipRecheck: {
			run: async (db, today) =>
				describeRecheckCounts(await recheckOpenOrders(db, forecastSource(db), today)),
			timeZoneFallback: env.SHOP_TIME_ZONE
		},
		// Links in waitlist mail: the same origin and secret the request side uses.
		...(env.AUTH_SECRET && env.AUTH_SECRET.length >= 32
			? {
					waitlist: {
						origin: (env.ORIGIN ?? 'http://127.0.0.1:3000').replace(/\/$/, ''),
						secret: env.AUTH_SECRET
					}
				}
			: {})
	};
}
