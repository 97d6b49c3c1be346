import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { describe, expect, it } from 'vitest';
import { tableChecksum, woffToSfnt } from './woff';

const require = createRequire(import.meta.url);
const shipped = (file: string) =>
	readFileSync(require.resolve(`@fontsource/source-sans-3/files/${file}`));

/** The sfnt's table records: tag, checksum, offset, length (OpenType "Table Directory"). */
function records(sfnt: Buffer) {
	const count = sfnt.readUInt16BE(4);
	return Array.from({ length: count }, (_, index) => {
		const at = 12 + index * 16;
		return {
			tag: sfnt.toString('latin1', at, at + 4),
			checksum: sfnt.readUInt32BE(at + 4),
			offset: sfnt.readUInt32BE(at + 8),
			length: sfnt.readUInt32BE(at + 12)
		};
	});
}

describe('WOFF to OpenType', () => {
	it('unpacks every table to the checksum the WOFF directory recorded for it (WOFF 1.0, 5; OpenType checksums)', () => {
		for (const file of [
			'source-sans-3-latin-400-normal.woff',
			'source-sans-3-latin-ext-700-normal.woff',
			'source-sans-3-cyrillic-400-italic.woff'
		]) {
			const woff = shipped(file);
			const sfnt = woffToSfnt(woff);
			// The flavor travels unchanged: TrueType 0x00010000 or 'OTTO'.
			expect(sfnt.readUInt32BE(0)).toBe(woff.readUInt32BE(4));
			const tables = records(sfnt);
			expect(tables.length).toBe(woff.readUInt16BE(12));
			for (const table of tables) {
				const data = Buffer.from(sfnt.subarray(table.offset, table.offset + table.length));
				// The head table is summed with its checkSumAdjustment (bytes 8–11) as zero.
				if (table.tag === 'head') data.fill(0, 8, 12);
				expect(table.offset % 4).toBe(0);
				expect(tableChecksum(data), `${file} ${table.tag}`).toBe(table.checksum);
			}
			expect(tables.map((t) => t.tag)).toContain('cmap');
		}
	});

	it('writes the offset table’s search hints as OpenType defines them', () => {
		const sfnt = woffToSfnt(shipped('source-sans-3-latin-400-normal.woff'));
		const count = sfnt.readUInt16BE(4);
		const power = 2 ** Math.floor(Math.log2(count));
		expect(sfnt.readUInt16BE(6)).toBe(power * 16);
		expect(sfnt.readUInt16BE(8)).toBe(Math.log2(power));
		expect(sfnt.readUInt16BE(10)).toBe(count * 16 - power * 16);
	});

	it('refuses what is not WOFF 1.0', () => {
		expect(() => woffToSfnt(shipped('source-sans-3-latin-400-normal.woff2'))).toThrow(TypeError);
		expect(() => woffToSfnt(new Uint8Array(10))).toThrow(TypeError);
	});
});
