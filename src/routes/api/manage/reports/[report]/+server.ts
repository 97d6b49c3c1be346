import { reportEndpoint } from '$lib/server/reports/endpoint';
import type { RequestHandler } from './$types';

// One owner's report as JSON, or with ?format=csv&section=<id> one of its tables as a file.
export const GET: RequestHandler = (event) => reportEndpoint(event, event.params.report);
