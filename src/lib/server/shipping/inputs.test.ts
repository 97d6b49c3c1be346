import { describe, expect, it } from 'vitest';
import { addDays } from '$lib/format/dates';
import type { ShopSetting } from '$lib/server/db/schema';
import type { ForecastSource } from '$lib/server/weather/source';
import { shipCheck } from '$lib/shipping/ship-check';
import { buildShipCheckInput, rememberingSource, shipRulesFromSettings } from './inputs';

const settings: ShopSetting = {
	id: true,
	shop_name: 'Mossback Hollow Inverts',
	origin_zip: '37902',
	time_zone: 'America/New_York',
	ship_weekdays_overnight: [1, 2, 3],
	ship_weekdays_two_day: [1, 2],
	heat_pack_below_f: 50,
	hold_below_f: 25,
	cold_pack_above_f: 85,
	hold_above_f: 95,
	extra_closed_dates: ['2026-12-07'],
	forecast_horizon_days: 5,
	fee_overnight_cents: 4500,
	fee_two_day_cents: 2800,
	reservation_minutes: 30,
	claim_window_hours: 2,
	slip_paper: 'letter',
	updated_at: new Date('2026-12-01T12:00:00Z')
};

/** Mild days from 2026-12-01 (a Tuesday) for every ZIP, counting the questions asked. */
function mildSource(asked: string[] = []): ForecastSource {
	return {
		async daily(zip, days) {
			asked.push(`${zip}:${days}`);
			return {
				ok: true,
				from: 'service',
				days: Array.from({ length: days }, (_, i) => ({
					date: addDays('2026-12-01', i),
					lowF: 55,
					highF: 70
				}))
			};
		}
	};
}

describe('shipRulesFromSettings', () => {
	it('takes the weekdays of the service and the four thresholds from the row', () => {
		expect(shipRulesFromSettings(settings, 'two_day')).toEqual({
			service: 'two_day',
			shipWeekdays: [1, 2],
			thresholds: { heatPackBelowF: 50, holdBelowF: 25, coldPackAboveF: 85, holdAboveF: 95 },
			extraClosedDates: ['2026-12-07']
		});
		expect(shipRulesFromSettings(settings, 'overnight').shipWeekdays).toEqual([1, 2, 3]);
	});
});

describe('buildShipCheckInput', () => {
	it('asks for both ends over the horizon and keeps only what the check reads', async () => {
		const asked: string[] = [];
		const input = await buildShipCheckInput(mildSource(asked), settings, {
			service: 'overnight',
			destinationZip: ' 85719 ',
			firstDate: '2026-12-01'
		});
		expect(asked.sort()).toEqual(['37902:5', '85719:5']);
		expect(input.today).toBe('2026-12-01');
		expect(input.destinationZip).toBe('85719');
		expect(input.origin).toHaveLength(5);
		expect(Object.keys(input.destination[0]!).sort()).toEqual(['date', 'highF', 'lowF']);
		expect(input.forecastProblems).toEqual({});
		// Mild weather on a Tuesday with Wednesday a business day: ships today, overnight.
		expect(shipCheck(input)).toMatchObject({ decision: 'ship', shipDate: '2026-12-01' });
	});

	it('turns a failed or throwing forecast into no days, so the check holds', async () => {
		const failing: ForecastSource = {
			async daily(zip, days) {
				if (zip === '55805') return { ok: false, problem: 'provider answered 503' };
				if (zip === '97103') throw new Error('socket hang up');
				return mildSource().daily(zip, days);
			}
		};
		for (const [zip, problem] of [
			['55805', 'provider answered 503'],
			['97103', 'socket hang up']
		] as const) {
			const input = await buildShipCheckInput(failing, settings, {
				service: 'overnight',
				destinationZip: zip,
				firstDate: '2026-12-01'
			});
			expect(input.destination).toEqual([]);
			expect(input.forecastProblems).toEqual({ destination: problem });
			const result = shipCheck(input);
			expect(result.decision).toBe('hold');
			expect(result.reasons.map((reason) => reason.rule)).toEqual(['no_forecast']);
		}
	});
});

describe('rememberingSource', () => {
	it('asks once per ZIP and horizon', async () => {
		const asked: string[] = [];
		const once = rememberingSource(mildSource(asked));
		await Promise.all([once.daily('37902', 5), once.daily('37902', 5), once.daily('85719', 5)]);
		await once.daily('37902', 5);
		expect(asked.sort()).toEqual(['37902:5', '85719:5']);
	});
});
