/**
 * Every CSV Tacksheet hands out writes text a spreadsheet would run as a formula with a
 * leading quote: the weld log (download and turnover set) and the turnover set's
 * inspections.csv. Source: OWASP, "CSV Injection" (cells starting with =, +, -, @, tab, CR).
 */
import { PassThrough } from 'node:stream';
import { eq } from 'drizzle-orm';
import { beforeAll, describe, expect, it } from 'vitest';
import { db, schema } from '$lib/server/db';
import { seedIfEmpty } from '$lib/server/demo/seed';
import * as weldLog from '$lib/server/weld-log';
import { inspectionsCsv } from '$lib/server/export/records';
import { resolve } from '$lib/server/export/scope';
import { weldLogFilter } from '$lib/schemas/weld-log';

let projectId: number;
let jointId: number;

beforeAll(async () => {
	await seedIfEmpty();
	projectId = db.select().from(schema.projects).where(eq(schema.projects.code, 'LBM-20')).get()!.id;
	// A joint of the project with at least one inspection, so both files carry its free text.
	const inspection = db
		.select({ id: schema.inspections.id, jointId: schema.inspections.jointId })
		.from(schema.inspections)
		.innerJoin(schema.joints, eq(schema.joints.id, schema.inspections.jointId))
		.where(eq(schema.joints.projectId, projectId))
		.limit(1)
		.get()!;
	jointId = inspection.jointId;
	// Free text as a person (or a hostile file) might type it.
	db.update(schema.joints)
		.set({ line: '=HYPERLINK("http://x.test","open")', material: '-2+3' })
		.where(eq(schema.joints.id, jointId))
		.run();
	db.update(schema.inspections)
		.set({ reportNo: '-1+1', reason: '+CMD' })
		.where(eq(schema.inspections.id, inspection.id))
		.run();
}, 120_000);

async function weldLogText(): Promise<string> {
	const out = new PassThrough();
	const chunks: Buffer[] = [];
	out.on('data', (c: Buffer) => chunks.push(c));
	await weldLog.writeCsv(weldLog.iterate(projectId, weldLogFilter.parse({})), out);
	return Buffer.concat(chunks).toString('utf8');
}

describe('CSV files', () => {
	it('the weld log writes formula-like text with a leading quote', async () => {
		const text = await weldLogText();
		expect(text).toContain(`"'=HYPERLINK(""http://x.test"",""open"")"`);
		expect(text).toContain(`,'-2+3,`);
		expect(text).not.toMatch(/(^|,)=HYPERLINK/m);
	});

	it("the turnover set's inspections.csv does the same, minus signs included", () => {
		const drawings = resolve(projectId, {
			scope: { all: true },
			includeSuperseded: false,
			acceptedOnly: false
		});
		const text = inspectionsCsv(
			{ scope: { all: true }, includeSuperseded: false, acceptedOnly: false },
			drawings
		).toString('utf8');
		expect(text).toContain(`'-1+1`);
		expect(text).toContain(`'+CMD`);
		expect(text).not.toMatch(/(^|,)-1\+1/m);
	});
});
