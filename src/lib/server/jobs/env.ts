// startJobs options from the app's environment, for hooks.server.ts:
//   export const init = async () => { await startJobs(jobsOptionsFromEnv()); };
import { env } from '$env/dynamic/private';
import { mailConfigFromEnv } from '../mail/env';
import type { JobsOptions } from '.';

/** DATABASE_URL, SMTP_URL and MAIL_FROM. */
export function jobsOptionsFromEnv(): JobsOptions {
	const connectionString = env.DATABASE_URL;
	if (!connectionString) throw new Error('DATABASE_URL is not set; copy .env.example to .env');
	return { connectionString, ...mailConfigFromEnv() };
}
