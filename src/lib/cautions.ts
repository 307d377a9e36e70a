// The cautions shown wherever a prediction may be relied on (ranking, comparison, projects,
// review records, exported sheets): one text, so every place says the same.
export const CAUTION_TITLE = 'Read before relying on these numbers';

export const CAUTIONS: readonly string[] = [
	'Predictions are model estimates from bench measurements of particular samples, not guarantees.',
	'Leakage varies by lot, humidity, contamination and board layout; guarding and clean, dry assembly matter as much as the part.',
	'Circuits that touch people, mains or hazardous energy follow the applicable safety standards and local codes and are signed off by qualified, licensed practice.'
];
