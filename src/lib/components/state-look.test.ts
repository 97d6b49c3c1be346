import { describe, expect, it } from 'vitest';
import { stateLabels, statesOf, type StateKind } from '$lib/format/labels';
import { stateLooks } from './state-look';

const kinds = Object.keys(stateLabels) as StateKind[];

describe('state looks', () => {
	it('gives every state of a kind its own shape, so colour is never the only cue', () => {
		for (const kind of kinds) {
			const shapes = statesOf(kind).map(
				(state) => (stateLooks[kind] as Record<string, { icon: string }>)[state as string]?.icon
			);
			expect(shapes.every(Boolean), kind).toBe(true);
			expect(new Set(shapes).size, kind).toBe(shapes.length);
		}
	});

	it('keeps brick for loss and refusal, amber for what needs care', () => {
		expect(stateLooks.order.cancelled.tone).toBe('brick');
		expect(stateLooks.claim.declined.tone).toBe('brick');
		expect(stateLooks.order.weather_hold.tone).toBe('amber');
		expect(stateLooks.clutch.paused.tone).toBe('amber');
		const brickStates = kinds.flatMap((kind) =>
			Object.entries(stateLooks[kind])
				.filter(([, look]) => look.tone === 'brick')
				.map(([state]) => `${kind}:${state}`)
		);
		expect(brickStates.sort()).toEqual([
			'claim:declined',
			'claim:refunded',
			'order:cancelled',
			'order:part_refunded',
			'order:refunded'
		]);
	});
});
