// Hatchlot's own line icons, drawn on a 24 × 24 grid with round 1.8 px strokes.
// Each state of the domain has its own shape, so a state never rests on colour alone.

export type IconShape =
	| { d: string; fill?: boolean }
	| { cx: number; cy: number; r: number; fill?: boolean }
	| { x: number; y: number; width: number; height: number; rx?: number; fill?: boolean };

// The tub outline is shared by the three resting-tub shapes: substrate set aside in a tub.
const tub = { d: 'M4 10.5h16l-1.6 8.1a2 2 0 0 1-2 1.6H7.6a2 2 0 0 1-2-1.6z' };

export const icons = {
	// ---- resting tubs
	hourglass: [
		{ d: 'M7 3.5h10M7 20.5h10' },
		{ d: 'M8.5 3.5v2.2c0 2.3 3.5 4 3.5 6.3s-3.5 4-3.5 6.3v2.2' },
		{ d: 'M15.5 3.5v2.2c0 2.3-3.5 4-3.5 6.3s3.5 4 3.5 6.3v2.2' },
		{ d: 'M10.2 18.2h3.6' }
	],
	'tub-young': [
		tub,
		{ cx: 8.5, cy: 6.5, r: 1.3, fill: true },
		{ cx: 12.5, cy: 4.5, r: 1.3, fill: true },
		{ cx: 15.5, cy: 7, r: 1.3, fill: true }
	],
	'tub-empty': [tub, { d: 'M9.5 6.5h5' }],
	// ---- clutches
	sprout: [
		{ d: 'M12 20.5V12' },
		{ d: 'M12 13.5c-4 0-6.5-2.4-6.5-6.5 4 0 6.5 2.4 6.5 6.5z' },
		{ d: 'M12 11.5c0-3.5 2.3-6 6.5-6 0 3.6-2.4 6-6.5 6z' },
		{ d: 'M7.5 20.5h9' }
	],
	'check-circle': [{ cx: 12, cy: 12, r: 8.5 }, { d: 'm8.2 12.3 2.6 2.6 5-5.3' }],
	tag: [
		{
			d: 'M3.8 4.8v6.1l9.1 9.1a1.5 1.5 0 0 0 2.1 0l5-5a1.5 1.5 0 0 0 0-2.1L10.9 3.8H4.8a1 1 0 0 0-1 1z'
		},
		{ cx: 8, cy: 8, r: 1.4, fill: true }
	],
	'box-empty': [
		{ d: 'M4.5 9h15v10a1.5 1.5 0 0 1-1.5 1.5H6A1.5 1.5 0 0 1 4.5 19z' },
		{ d: 'M3.5 5h17v4h-17z' },
		{ d: 'M10 13h4' }
	],
	'pause-circle': [{ cx: 12, cy: 12, r: 8.5 }, { d: 'M10 9v6M14 9v6' }],
	// ---- orders
	clock: [{ cx: 12, cy: 12, r: 8.5 }, { d: 'M12 7.5V12l3 2' }],
	banknote: [
		{ x: 2.8, y: 6.5, width: 18.4, height: 11, rx: 1.8 },
		{ cx: 12, cy: 12, r: 2.4 },
		{ d: 'M6 9.5v5M18 9.5v5' }
	],
	calendar: [
		{ x: 3.5, y: 5, width: 17, height: 15.5, rx: 2 },
		{ d: 'M3.5 10h17M8 3v4M16 3v4' },
		{ d: 'm9.2 15 1.9 1.9 3.7-3.7' }
	],
	thermometer: [
		{ d: 'M10 14.2V5a2 2 0 1 1 4 0v9.2a4 4 0 1 1-4 0z' },
		{ d: 'M12 10v7' },
		{ d: 'M17.5 5.5h2.5M17.5 9h2.5' }
	],
	parcel: [
		{ d: 'M3.5 7.5 12 3.5l8.5 4v9L12 20.5l-8.5-4z' },
		{ d: 'M3.5 7.5 12 11.5l8.5-4M12 11.5v9' },
		{ d: 'm7.8 5.5 8.4 4' }
	],
	van: [
		{ d: 'M2.5 6.5h11v10h-11z' },
		{ d: 'M13.5 9.5h4l3 3.5v3.5h-7' },
		{ cx: 7, cy: 17.5, r: 1.8 },
		{ cx: 17, cy: 17.5, r: 1.8 }
	],
	doorstep: [
		{ d: 'M3.5 11 12 4l8.5 7' },
		{ d: 'M6 9.2V20h12V9.2' },
		{ d: 'm9.3 14.6 2 2 3.6-3.7' }
	],
	'x-circle': [{ cx: 12, cy: 12, r: 8.5 }, { d: 'm9 9 6 6m0-6-6 6' }],
	'return-arrow': [{ d: 'M4.5 12a7.5 7.5 0 1 0 2.2-5.3' }, { d: 'M4.5 4v4.5H9' }],
	'half-return': [
		{ d: 'M4.5 12a7.5 7.5 0 1 0 2.2-5.3' },
		{ d: 'M4.5 4v4.5H9' },
		{ d: 'M12 8a4 4 0 0 1 0 8z', fill: true }
	],
	// ---- listings
	pencil: [
		{ d: 'M4 20l1-4.4L15.8 4.8a1.8 1.8 0 0 1 2.5 0l.9.9a1.8 1.8 0 0 1 0 2.5L8.4 19z' },
		{ d: 'm14 6.6 3.4 3.4' }
	],
	'live-dot': [
		{ cx: 12, cy: 12, r: 2.8, fill: true },
		{ d: 'M7 7a7 7 0 0 0 0 10M17 7a7 7 0 0 1 0 10' }
	],
	'minus-square': [{ x: 4, y: 4, width: 16, height: 16, rx: 3 }, { d: 'M8.5 12h7' }],
	// ---- claims
	flag: [{ d: 'M5.5 21V4' }, { d: 'M5.5 4.5h11.5l-2.5 4 2.5 4H5.5' }],
	'loop-arrows': [
		{ d: 'M4.5 10.5a7.5 7.5 0 0 1 13.2-3.6L19.5 9' },
		{ d: 'M19.5 4.5V9H15' },
		{ d: 'M19.5 13.5a7.5 7.5 0 0 1-13.2 3.6L4.5 15' },
		{ d: 'M4.5 19.5V15H9' }
	],
	'slash-circle': [{ cx: 12, cy: 12, r: 8.5 }, { d: 'm6 6 12 12' }],
	// ---- notices
	info: [{ cx: 12, cy: 12, r: 8.5 }, { d: 'M12 11v5.5' }, { cx: 12, cy: 7.8, r: 1.1, fill: true }],
	caution: [
		{ d: 'M10.3 4.2 2.9 17.4A2 2 0 0 0 4.6 20.5h14.8a2 2 0 0 0 1.7-3.1L13.7 4.2a2 2 0 0 0-3.4 0z' },
		{ d: 'M12 9.5v4.5' },
		{ cx: 12, cy: 17, r: 1.1, fill: true }
	],
	stop: [
		{ d: 'M8.3 3h7.4L21 8.3v7.4L15.7 21H8.3L3 15.7V8.3z' },
		{ d: 'M12 7.5v5.5' },
		{ cx: 12, cy: 16.3, r: 1.1, fill: true }
	],
	// ---- general
	mail: [{ x: 3.5, y: 6, width: 17, height: 12.5, rx: 2 }, { d: 'm4.5 7.5 7.5 6 7.5-6' }],
	person: [{ cx: 12, cy: 8.5, r: 3.6 }, { d: 'M5 20c.8-3.8 3.6-5.8 7-5.8s6.2 2 7 5.8' }],
	key: [{ cx: 8, cy: 12, r: 3.8 }, { d: 'M11.8 12H20.5M17.5 12v3M20 12v2.2' }],
	home: [{ d: 'M3.5 11 12 4l8.5 7' }, { d: 'M6 9.2V20h4.5v-5.5h3V20H18V9.2' }],
	leaf: [{ d: 'M5 19c0-8.5 5-14 15-14 0 10-5.5 15-14 15' }, { d: 'M5 19c3-4 6-6.5 10-8.5' }],
	menu: [{ d: 'M4 7h16M4 12h16M4 17h16' }],
	close: [{ d: 'm6 6 12 12M18 6 6 18' }],
	'arrow-right': [{ d: 'M4.5 12h15M13.5 6l6 6-6 6' }],
	'chevron-down': [{ d: 'm6 9 6 6 6-6' }],
	sliders: [
		{ d: 'M4 7h9M17 7h3M4 17h3M11 17h9' },
		{ cx: 15, cy: 7, r: 2 },
		{ cx: 9, cy: 17, r: 2 }
	],
	swatch: [
		{ x: 3.5, y: 3.5, width: 7.5, height: 7.5, rx: 1.5 },
		{ x: 13, y: 3.5, width: 7.5, height: 7.5, rx: 1.5, fill: true },
		{ x: 3.5, y: 13, width: 7.5, height: 7.5, rx: 1.5, fill: true },
		{ x: 13, y: 13, width: 7.5, height: 7.5, rx: 1.5 }
	],
	grid: [
		{ x: 3.5, y: 4.5, width: 17, height: 15, rx: 1.5 },
		{ d: 'M3.5 9.5h17M3.5 14.5h17M9.5 9.5v10' }
	],
	storefront: [
		{ d: 'M4 9.5V20h16V9.5' },
		{
			d: 'M3 9.5 4.8 4h14.4L21 9.5c0 1.4-1.2 2.5-2.6 2.5s-2.7-1.1-2.7-2.5c0 1.4-1.2 2.5-2.6 2.5h-.2c-1.4 0-2.6-1.1-2.6-2.5 0 1.4-1.3 2.5-2.7 2.5S3 10.9 3 9.5z'
		},
		{ d: 'M10 20v-4.5h4V20' }
	],
	// ---- back office
	tub: [tub, { d: 'M6.5 10.5 8 7.5h8l1.5 3' }],
	checklist: [
		{ d: 'm4 7 1.6 1.6L8.5 5.5M4 13.5l1.6 1.6 2.9-3.1' },
		{ d: 'M11 7.5h9M11 14h9M4 19.5h16' }
	],
	bars: [{ d: 'M4 20.5h16' }, { d: 'M6.5 17V11M11 17V6.5M15.5 17v-8M20 17v-4' }],
	// Reports: two axes and a line that climbs.
	trend: [{ d: 'M4 3.5v16.5h16.5' }, { d: 'M7.5 15.5l3.6-4.3 3 2.6 5.4-6.6' }],
	// A file to keep: an arrow into a tray.
	download: [
		{ d: 'M12 3.5v11.5' },
		{ d: 'M7.5 10.5 12 15l4.5-4.5' },
		{ d: 'M4.5 16.5v3.5h15v-3.5' }
	],
	layers: [
		{ d: 'm12 4 8.5 4.3L12 12.6 3.5 8.3z' },
		{ d: 'm3.5 12.3 8.5 4.3 8.5-4.3M3.5 16.3l8.5 4.3 8.5-4.3' }
	],
	camera: [{ d: 'M4 8.5h3.2L9 6h6l1.8 2.5H20v11H4z' }, { cx: 12, cy: 13.5, r: 3.3 }],
	book: [
		{ d: 'M12 6.5C10 5 7 4.5 4 5v13.5c3-.5 6 0 8 1.5 2-1.5 5-2 8-1.5V5c-3-.5-6 0-8 1.5zM12 6.5V20' }
	],
	plus: [{ d: 'M12 5v14M5 12h14' }],
	minus: [{ d: 'M5 12h14' }],
	// A woven gathering basket: what the buyer has picked so far.
	basket: [
		{ d: 'M3.5 9.5h17l-1.8 9a2 2 0 0 1-2 1.6H7.3a2 2 0 0 1-2-1.6z' },
		{ d: 'M8 9.5 10.5 4M16 9.5 13.5 4' },
		{ d: 'M9 13v4M12 13v4M15 13v4' }
	],
	trash: [
		{ d: 'M4.5 7h15M9.5 7V4.5h5V7' },
		{ d: 'M6.5 7l1 12.2a1.5 1.5 0 0 0 1.5 1.3h6a1.5 1.5 0 0 0 1.5-1.3l1-12.2' }
	],
	// ---- animal groups, for species tiles
	millipede: [
		// Side view: a long body of many rings, two legs to a ring, antennae at the head.
		{ x: 2.5, y: 8.5, width: 16.5, height: 6, rx: 3 },
		{ d: 'M6.5 8.6v5.8M9.5 8.5v6M12.5 8.5v6M15.5 8.6v5.8' },
		{
			d: 'M4.5 14.4 3.8 17M7 14.5l-.4 2.6M8.9 14.5l.1 2.6M11 14.5v2.6M13 14.5l.1 2.6M15 14.5l.3 2.6M17 14.2l.7 2.5'
		},
		{ d: 'M18.6 9.8 21.5 6.5M19 11.2l3.3-1.6' }
	],
	isopod: [
		{ d: 'M12 4.5c3.8 0 6 3.4 6 8.2S15.8 21 12 21s-6-3.5-6-8.3 2.2-8.2 6-8.2z' },
		{ d: 'M6.5 9.2h11M6 12.6h12M6.4 16h11.2M7.6 18.8h8.8' },
		{ d: 'M10.5 4.8 8 2M13.5 4.8 16 2M9.5 21l-1 1.5M14.5 21l1 1.5' }
	],
	springtail: [
		// Soft long body, long antennae, and the folded spring (furcula) under the tail.
		{ d: 'M3.5 15.5c0-3 2.6-5.5 6.5-5.5h5c2.6 0 4.2 1.4 4.2 3.2 0 1.4-1.2 2.3-3 2.3z' },
		{ d: 'M17.8 10.6 19.6 6l2.2-1.8M18.8 11.4l2.9-2.4 1.3-.2' },
		{ d: 'M8.5 15.5l-1 2.8M11.5 15.5v2.8M14.5 15.5l1 2.8' },
		{ d: 'M4.5 16.5 7 19.5h3' }
	],
	beetle: [
		{ d: 'M12 7.5c3.5 0 5.5 3 5.5 6.8S15 21 12 21s-5.5-2.9-5.5-6.7 2-6.8 5.5-6.8z' },
		{ cx: 12, cy: 5.2, r: 2.2 },
		{ d: 'M12 9v12M10.5 3.4 9 1.5M13.5 3.4 15 1.5' },
		{ d: 'M6.8 11.5 4 10M6.5 15H3.5M7.2 18.3 4.5 20M17.2 11.5 20 10M17.5 15h3M16.8 18.3l2.7 1.7' }
	],
	roach: [
		{ d: 'M12 6.5c3.3 0 5 3.5 5 7.5s-1.9 7-5 7-5-3-5-7 1.7-7.5 5-7.5z' },
		{ d: 'M8.5 6.8c.8-1.2 2-1.8 3.5-1.8s2.7.6 3.5 1.8' },
		{ d: 'M10.8 5.1C9 3.5 6.5 2.5 4 2.5M13.2 5.1c1.8-1.6 4.3-2.6 6.8-2.6' },
		{
			d: 'M12 9.5V21M7.3 11.5 4.5 10M7 15H4M7.4 18.5 5 20.5M16.7 11.5l2.8-1.5M17 15h3M16.6 18.5l2.4 2'
		}
	]
} as const satisfies Record<string, readonly IconShape[]>;

export type IconName = keyof typeof icons;
