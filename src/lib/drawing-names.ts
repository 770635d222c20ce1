/**
 * A drawing number and revision proposed from an uploaded file's name, for the person to
 * confirm: `LBM-20-ISO-1101_rev1.pdf` → `LBM-20-ISO-1101`, revision `1`. Pure.
 */
const REVISION_SUFFIX = /[\s_.-]+(?:rev(?:ision)?|r)[\s_.-]*([A-Z0-9]{1,3})$/i;

export function proposeFromFileName(fileName: string): { number: string; revision: string | null } {
	const stem = fileName
		.replace(/^.*[\\/]/, '')
		.replace(/\.pdf$/i, '')
		.trim();
	const revision = REVISION_SUFFIX.exec(stem);
	const number = (revision ? stem.slice(0, revision.index) : stem).replace(/[\s_]+$/, '').trim();
	return { number: number || stem, revision: revision ? revision[1].toUpperCase() : null };
}
