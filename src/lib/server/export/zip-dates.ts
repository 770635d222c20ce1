/**
 * Sets the date of every entry of a finished zip held in memory, in both the central directory
 * and each local header (PKWARE APPNOTE 6.3.x, 4.3.7 and 4.3.12; MS-DOS date and time, two
 * seconds resolution, written here in UTC as archiver writes them by default).
 *
 * The spreadsheet writer zips the workbook's parts itself and dates each part "now", with no
 * option to change it; rewriting the eight bytes per entry afterwards touches nothing else, so
 * the workbook of unchanged rows comes out byte-identical. Only plain zips are handled (no
 * zip64, no multi-disk), which a weld log never needs; anything else is refused, not guessed.
 */

const EOCD = 0x06054b50;
const CENTRAL = 0x02014b50;
const LOCAL = 0x04034b50;

function dosDateTime(date: Date): { time: number; day: number } {
	const year = Math.min(Math.max(date.getUTCFullYear(), 1980), 2107);
	return {
		time:
			(date.getUTCHours() << 11) |
			(date.getUTCMinutes() << 5) |
			Math.floor(date.getUTCSeconds() / 2),
		day: ((year - 1980) << 9) | ((date.getUTCMonth() + 1) << 5) | date.getUTCDate()
	};
}

function endOfCentralDirectory(zip: Buffer): number {
	// The record is 22 bytes plus a comment of at most 65535 bytes.
	const lowest = Math.max(0, zip.length - 22 - 0xffff);
	for (let at = zip.length - 22; at >= lowest; at--) if (zip.readUInt32LE(at) === EOCD) return at;
	throw new Error('Not a zip: no end-of-central-directory record.');
}

/** A copy of `zip` with every entry dated `date`. */
export function withEntryDates(zip: Buffer, date: Date): Buffer {
	const out = Buffer.from(zip);
	const eocd = endOfCentralDirectory(out);
	const entries = out.readUInt16LE(eocd + 10);
	const offset = out.readUInt32LE(eocd + 16);
	if (entries === 0xffff || offset === 0xffffffff)
		throw new Error('A zip64 archive cannot be re-dated here.');
	const { time, day } = dosDateTime(date);
	let at = offset;
	for (let i = 0; i < entries; i++) {
		if (out.readUInt32LE(at) !== CENTRAL) throw new Error('Damaged zip: bad central directory.');
		out.writeUInt16LE(time, at + 12);
		out.writeUInt16LE(day, at + 14);
		const local = out.readUInt32LE(at + 42);
		if (local === 0xffffffff || out.readUInt32LE(local) !== LOCAL)
			throw new Error('Damaged zip: an entry has no local header.');
		out.writeUInt16LE(time, local + 10);
		out.writeUInt16LE(day, local + 12);
		at += 46 + out.readUInt16LE(at + 28) + out.readUInt16LE(at + 30) + out.readUInt16LE(at + 32);
	}
	return out;
}
