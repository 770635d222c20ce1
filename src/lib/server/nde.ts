/**
 * NDE extent: lots formed by the project's rule, seeded random selection with every welder
 * represented, progressive examination with tracers (ASME B31.3 341.3.4), requests to the NDE
 * contractor, and the figures and records that follow. The verbs live in `./nde/`; this is
 * the one import for everything else: `import * as nde from '$lib/server/nde'`.
 */
export { afterWeld, afterCutOut, sync, syncAll, close, reopen, saveRule } from './nde/manage';
export { afterResult, type ResultAnswer, type ResultExtras } from './nde/results';
export { lotSample, refreshLot } from './nde/standing';
export { propose, commit, swap, pickShortTracers } from './nde/selection';
export { send as sendRequest, list as requests, due, RequestNotSent } from './nde/requests';
export {
	list,
	detail,
	overview,
	forJoint,
	NDE_CAUTION,
	type LotItem,
	type LotDetail
} from './nde/view';
export {
	welderRates,
	repairRates,
	welderStamps,
	projectRate,
	lotRates,
	logFields,
	logWhere,
	registerCsv,
	SELECTION_FILTERS,
	type LogFields,
	type SelectionFilter
} from './nde/figures';
export { projectRule, chainOf } from './nde/forming';
