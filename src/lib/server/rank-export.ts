// The ranking as the rank screen shows it, as a sheet: the operating point and basis stated
// above the table, each column's unit in the unit row, numbers in SI base units, flags in words.
import { formatTemperature } from '$lib/junction';
import { basisHeading, operatingPointWords, standing } from '$lib/rank/display';
import { FLAG_WORDS, KIND_LABEL, type RankItem, type RankOperatingPoint, type RankResponse } from '$lib/schemas/rank';
import { LIFECYCLE_LABEL } from '$lib/catalogue/vocabulary';
import { CAUTIONS } from '$lib/cautions';
import type { Sheet } from './sheets';

type Column = { label: string; unit: string; value: (r: RankItem, res: RankResponse) => string | number | null };

const COLUMNS: Column[] = [
	{ label: 'Rank', unit: '', value: (r) => r.rank },
	{ label: 'Part number', unit: '', value: (r) => r.partNumber },
	{ label: 'Maker', unit: '', value: (r) => r.maker },
	{ label: 'Kind', unit: '', value: (r) => KIND_LABEL[r.kind] },
	{ label: 'Package', unit: '', value: (r) => r.package || null },
	{ label: 'Lifecycle', unit: '', value: (r) => LIFECYCLE_LABEL[r.lifecycle] },
	{ label: 'Evidence', unit: '', value: (r) => (r.evidence === 'given' ? 'given model, not measured' : 'measured') },
	{ label: 'Samples', unit: 'count', value: (r) => r.samples },
	{ label: 'Leakage typical, hot end', unit: 'A', value: (r) => r.leakageA.typical },
	{ label: 'Leakage worst sample, hot end', unit: 'A', value: (r) => r.leakageA.worst },
	{ label: 'Leakage bound, hot end', unit: 'A', value: (r) => r.leakageA.bound },
	{ label: 'Bound tolerance factor k', unit: '1', value: (r) => r.bound?.k ?? null },
	{ label: 'Forward drop typical, hot end', unit: 'V', value: (r) => r.forwardDropV?.hot ?? null },
	{ label: 'Forward drop typical, cold end', unit: 'V', value: (r) => r.forwardDropV?.cold ?? null },
	{ label: 'Forward drop worst', unit: 'V', value: (r) => r.forwardDropV?.worst ?? null },
	{ label: 'Reverse margin', unit: 'V', value: (r) => r.reverseMarginV },
	{ label: 'Rated reverse voltage', unit: 'V', value: (r) => r.ratedReverseV },
	{ label: 'Error voltage', unit: 'V', value: (r) => r.errorVoltageV },
	{ label: 'Capacitance', unit: 'F', value: (r) => r.capacitanceF },
	{ label: 'Current noise typical', unit: 'A/√Hz', value: (r) => r.noiseA_rtHz.typical },
	{ label: 'Current noise worst sample', unit: 'A/√Hz', value: (r) => r.noiseA_rtHz.worst },
	{ label: 'Current noise bound', unit: 'A/√Hz', value: (r) => r.noiseA_rtHz.bound },
	{ label: 'Meets every limit', unit: '', value: (r) => (r.meetsLimits ? 'yes' : 'no') },
	{ label: 'Standing', unit: '', value: (r, res) => standing(r, res.basis) },
	{ label: 'Flags', unit: '', value: (r) => r.flags.map((f) => FLAG_WORDS[f].short).join('; ') || 'none' },
	{ label: 'Catalogue id', unit: '', value: (r) => r.id }
];

/** The lines stated above the table: the operating point, the basis, the temperatures each column is taken at, the cautions. */
function rankPreamble(op: RankOperatingPoint, res: RankResponse, query: string): string[] {
	return [
		`Operating point: ${operatingPointWords(op)}`,
		basisHeading(res.basis, res.coverage, res.confidence),
		`Leakage at the hot end, ${formatTemperature(res.hotC)}; forward drop at ${formatTemperature(res.coldC)} and ${formatTemperature(res.hotC)}, worst of the samples`,
		`${res.evaluated} parts evaluated, ${res.excludedOverRating} left out for exceeding their reverse rating; the first ${res.items.length} listed`,
		`Ranking address: /rank?${query}`,
		...CAUTIONS
	];
}

/** The ranking as a sheet: one row per listed part, in ranking order. */
export function rankSheet(op: RankOperatingPoint, res: RankResponse, query: string): Sheet {
	return {
		name: 'Ranking',
		preamble: rankPreamble(op, res, query),
		columns: COLUMNS.map((c) => ({ label: c.label, unit: c.unit })),
		rows: res.items.map((r) => COLUMNS.map((c) => c.value(r, res)))
	};
}
