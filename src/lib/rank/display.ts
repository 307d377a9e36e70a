/** How the sentence shows each value once typed (SI prefixes, Unicode minus). */
import { formatBias, formatSI, formatTemperature } from '$lib/junction';
import { parseFields, type FieldName, type OpFields } from './operating-point-url';
import { BASIS_LABEL, type RankBasis, type RankItem, type RankOperatingPoint } from '$lib/schemas/rank';

/** Display text for a parsed field value, or null to leave the typed text alone. */
export function displayValue(field: FieldName, value: number): string | null {
	switch (field) {
		case 'bias':
			return formatBias(value);
		case 'tLo':
		case 'tHi':
			return formatTemperature(value);
		case 'clamp':
		case 'leakage':
			return formatSI(value, 'A');
		case 'maxDrop':
			return `${value.toFixed(Math.max(2, Math.min(4, -Math.floor(Math.log10(value)) + 2)))} V`;
		case 'margin':
		case 'allowedError':
			return formatSI(value, 'V');
		case 'source':
			return formatSI(value, 'Ω');
		case 'maxCap':
			return formatSI(value, 'F');
		case 'maxNoise':
			return noise(value);
		case 'coverage':
		case 'confidence':
			return percent(value);
		default:
			return null;
	}
}

/** A current with its prefix, or a dash. */
export function amps(a: number | null | undefined): string {
	if (a === null || a === undefined || !Number.isFinite(a)) return '—';
	// Below an attoamp the figure is a model floor, not a current anyone can measure.
	if (a !== 0 && Math.abs(a) < 1e-18) return '< 1 aA';
	return formatSI(a, 'A');
}

/** The fields as the sentence shows them: each valid value in the app's own notation. */
export function tidyFields(f: OpFields): OpFields {
	const { op } = parseFields(f);
	if (!op) return f;
	const out = { ...f, kinds: [...f.kinds], lifecycles: [...f.lifecycles] };
	const show = (field: FieldName, v: number | undefined) => {
		if (v === undefined) return;
		const text = displayValue(field, v);
		if (text) (out as Record<string, unknown>)[field] = text;
	};
	show('bias', op.biasV);
	if (op.temperatureRangeC) {
		show('tLo', op.temperatureRangeC[0]);
		show('tHi', op.temperatureRangeC[1]);
	} else show('tHi', op.temperatureC);
	show('clamp', op.clampCurrentA);
	show('maxDrop', op.maxForwardDropV);
	show('margin', op.reverseMarginV);
	show('source', op.sourceResistanceOhm);
	show('allowedError', op.allowedErrorV);
	show('leakage', op.leakageTargetA);
	show('maxCap', op.maxCapacitanceF);
	show('maxNoise', op.maxNoiseA_rtHz);
	show('coverage', op.coverage);
	show('confidence', op.confidence);
	return out;
}

export function volts(v: number | null | undefined, digits = 3): string {
	if (v === null || v === undefined || !Number.isFinite(v)) return '—';
	if (v !== 0 && Math.abs(v) < 1e-18) return '< 1 aV';
	return formatSI(v, 'V', { digits });
}

/** A current-noise density with its prefix (3.2 fA/√Hz), or a dash. */
export function noise(d: number | null | undefined): string {
	return d === null || d === undefined || !Number.isFinite(d) ? '—' : `${formatSI(d, 'A')}/√Hz`;
}

export function farads(f: number | null | undefined): string {
	return f === null || f === undefined || !Number.isFinite(f) ? '—' : formatSI(f, 'F');
}

/**
 * Why a part sits where it does beyond its leakage, in words, or null when nothing but
 * its value on the basis placed it: a part with only a given model ranks after every
 * measured part, a part without a value on the basis after those with one.
 */
export function standing(item: Pick<RankItem, 'evidence' | 'bound' | 'samples'>, basis: RankBasis): string | null {
	if (item.evidence === 'given') return 'not measured: given model only, listed after measured parts';
	if (basis === 'bound' && item.bound === null) return `${item.samples === 1 ? 'one sample' : 'too few samples'}: no bound, listed after parts with one`;
	return null;
}

/** The list's heading: what it is ranked by, with the bound's coverage and confidence. */
export function basisHeading(basis: RankBasis, coverage: number, confidence: number): string {
	if (basis === 'bound') return `Ranked by statistical bound (${percent(coverage)} of parts, ${percent(confidence)} confidence)`;
	return `Ranked by ${BASIS_LABEL[basis]}`;
}

/** A fraction as a percentage without float noise (0.95 → "95 %", 0.999 → "99.9 %"). */
export function percent(f: number): string {
	return `${Number((f * 100).toPrecision(6))} %`;
}

/**
 * An operating point in the sentence's own notation, short: "−5.000 V, 25 °C to 85 °C,
 * clamping 1 mA under 0.700 V" (the limits the sentence states, when given).
 */
export function operatingPointWords(op: RankOperatingPoint): string {
	const show = (field: FieldName, v: number) => displayValue(field, v) ?? String(v);
	const parts = [show('bias', op.biasV)];
	parts.push(op.temperatureRangeC ? `${show('tLo', op.temperatureRangeC[0])} to ${show('tHi', op.temperatureRangeC[1])}` : show('tHi', op.temperatureC ?? 25));
	if (op.clampCurrentA !== undefined)
		parts.push(`clamping ${show('clamp', op.clampCurrentA)}${op.maxForwardDropV !== undefined ? ` under ${show('maxDrop', op.maxForwardDropV)}` : ''}`);
	if (op.sourceResistanceOhm !== undefined) parts.push(`source ${show('source', op.sourceResistanceOhm)}`);
	if (op.allowedErrorV !== undefined) parts.push(`error at most ${show('allowedError', op.allowedErrorV)}`);
	if (op.leakageTargetA !== undefined) parts.push(`leakage at most ${show('leakage', op.leakageTargetA)}`);
	if (op.maxCapacitanceF !== undefined) parts.push(`capacitance at most ${show('maxCap', op.maxCapacitanceF)}`);
	if (op.reverseMarginV) parts.push(`margin ${show('margin', op.reverseMarginV)}`);
	return parts.join(', ');
}
