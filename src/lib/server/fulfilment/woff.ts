// WOFF 1.0 (the format @fontsource ships) back to the plain OpenType font it wraps,
// unpacked once per process with Node's zlib. pdfkit's font reader can read WOFF itself,
// but it inflates the tables in JavaScript again for every document, which made a
// one-slip PDF take half a second; a plain font costs it nothing to open.
import { inflateSync } from 'node:zlib';

const WOFF_SIGNATURE = 0x774f4646; // 'wOFF'
const WOFF_HEADER = 44;
const WOFF_ENTRY = 20;
const SFNT_HEADER = 12;
const SFNT_ENTRY = 16;

const pad4 = (length: number) => (length + 3) & ~3;

/**
 * The sfnt (TrueType or CFF OpenType) inside a WOFF 1.0 file (W3C WOFF File Format 1.0,
 * sections 3–5): the offset table rebuilt, each table inflated where it was compressed,
 * tables in the directory's order on 4-byte boundaries. Metadata and private blocks are
 * dropped: a PDF has no use for them.
 */
export function woffToSfnt(woff: Uint8Array): Buffer {
	const source = Buffer.from(woff.buffer, woff.byteOffset, woff.byteLength);
	if (source.length < WOFF_HEADER || source.readUInt32BE(0) !== WOFF_SIGNATURE)
		throw new TypeError('not a WOFF 1.0 file');
	const flavor = source.readUInt32BE(4);
	const numTables = source.readUInt16BE(12);
	const tables = Array.from({ length: numTables }, (_, index) => {
		const at = WOFF_HEADER + index * WOFF_ENTRY;
		const offset = source.readUInt32BE(at + 4);
		const compLength = source.readUInt32BE(at + 8);
		const origLength = source.readUInt32BE(at + 12);
		const stored = source.subarray(offset, offset + compLength);
		const data = compLength < origLength ? inflateSync(stored) : stored;
		if (data.length !== origLength)
			throw new TypeError(`WOFF table ${index} unpacks to ${data.length} bytes, not ${origLength}`);
		return { tag: source.readUInt32BE(at), checksum: source.readUInt32BE(at + 16), data };
	});

	const directoryEnd = SFNT_HEADER + numTables * SFNT_ENTRY;
	const size = tables.reduce((sum, table) => sum + pad4(table.data.length), directoryEnd);
	const sfnt = Buffer.alloc(size);
	// The offset table's search hints (OpenType, "Table Directory").
	const power = 2 ** Math.floor(Math.log2(Math.max(1, numTables)));
	sfnt.writeUInt32BE(flavor, 0);
	sfnt.writeUInt16BE(numTables, 4);
	sfnt.writeUInt16BE(power * 16, 6);
	sfnt.writeUInt16BE(Math.log2(power), 8);
	sfnt.writeUInt16BE(numTables * 16 - power * 16, 10);
	let offset = directoryEnd;
	tables.forEach((table, index) => {
		const at = SFNT_HEADER + index * SFNT_ENTRY;
		sfnt.writeUInt32BE(table.tag, at);
		sfnt.writeUInt32BE(table.checksum, at + 4);
		sfnt.writeUInt32BE(offset, at + 8);
		sfnt.writeUInt32BE(table.data.length, at + 12);
		table.data.copy(sfnt, offset);
		offset += pad4(table.data.length);
	});
	return sfnt;
}

/** An OpenType table checksum: the sum of its big-endian 32-bit words, zero-padded, mod 2³². */
export function tableChecksum(data: Uint8Array): number {
	const padded = Buffer.alloc(pad4(data.length));
	padded.set(data);
	let sum = 0;
	for (let at = 0; at < padded.length; at += 4) sum = (sum + padded.readUInt32BE(at)) >>> 0;
	return sum;
}
