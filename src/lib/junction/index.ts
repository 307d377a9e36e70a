/**
 * Junction physics engine: public surface. Pure TypeScript, no Node/DOM APIs.
 */
export { SI_2019, CODATA_2014, ZERO_CELSIUS_K, celsiusToKelvin, kelvinToCelsius, thermalVoltage } from './constants';
export type { PhysicalConstants } from './constants';
export {
	parseQuantity,
	parseVoltage,
	parseCurrent,
	parseResistance,
	parseCapacitance,
	parseFrequency,
	parseTemperature,
	parseNoiseDensity,
	formatSI,
	formatBias,
	formatTemperature,
	MINUS
} from './units';
export type { QuantityKind, ParsedTemperature, FormatOptions } from './units';
export { JUNCTION_KINDS, MATERIALS } from './names';
export type { JunctionKind, Material } from './names';
export { createModel, validateModel, canonicalMaterial, MATERIAL_DEFAULTS, SPICE_DEFAULTS } from './model';
export type { JunctionModel, JunctionModelInput, JunctionMaterial, MaterialDefault } from './model';
export { lambertW0, lambertW0Exp, logLambertW0Exp } from './lambert-w';
export { scaleModel, saturationCurrentAt, shuntResistanceAt, junctionPotentialAt, logSaturationFactor } from './temperature';
export type { ScaledJunction } from './temperature';
export {
	diodeCurrent,
	currentAtBias,
	forwardVoltage,
	voltageAtCurrent,
	zeroBiasConductance,
	junctionCurrent,
	solveBias
} from './shockley';
export { junctionCapacitance, depletionCapacitance, depletionCapacitanceAt } from './capacitance';
export type { DepletionParameters } from './capacitance';
export { parseSpiceNumber, parseModelCard, parseModelCards, emitModelCard } from './spice-card';
export type { ParsedModelCard, EmitOptions } from './spice-card';
export { emitSpiceBlock, spiceIdentifier, spiceNumber, shuntTce, needsSubcircuit, worstSampleAt, asciiText } from './spice-export';
export type { SpiceBlockInput, LabelledModel } from './spice-export';
export { SweepError, SweepTooLargeError, FitError } from './errors';
export type { DataIssue } from './errors';
export { parseSweepCsv, checkSweepSize, MAX_SWEEP_BYTES } from './csv';
export type { ParsedSweep, SweepRun, SweepOptions } from './csv';
export { parseCapacitanceCsv, sweepKindOf } from './cv-csv';
export type { ParsedCapacitanceSweep, CapacitanceRun } from './cv-csv';
export { fitSweep, fitSweepCsv } from './fit';
export { fitCapacitance, fitCapacitanceCsv, POOR_CV_FIT_RELATIVE } from './cv-fit';
export type { CapacitanceFitResult, CapacitanceFitOptions } from './cv-fit';
export type { FitResult, FitOptions, Interval } from './fit';
export { ModelTable } from './model-table';
export {
	CatalogueTable,
	explainFlag,
	FLAG_WORDS,
	flagsFromBits,
	temperatureEnds,
	FLAG_CODES,
	POOR_FIT_RMS_V,
	TEMPERATURE_EXTRAPOLATION_K,
	RANK_BASES,
	DEFAULT_BASIS,
	DEFAULT_COVERAGE,
	DEFAULT_CONFIDENCE,
	TOLERANCE_LIMITS,
	judgementOf,
	toleranceFactor,
	logNormalUpperBound
} from './rank';
export type {
	PartRecord,
	OperatingPoint,
	RankOptions,
	RankResult,
	RankedPart,
	FlagCode,
	RankBasis,
	Judgement,
	BoundTerms,
	Evidence
} from './rank';
export { NODE, GUARD, RAIL_NAME, MAX_RAILS, MAX_POSITIONS, NodeError, networkIssues, checkNetwork, terminalVoltage, biasAt, biasRange, leavingSign, farTerminal } from './node';
export type { NodeNetwork, Placement, NodePosition, NodeIssue, Terminal } from './node';
export { NodeCircuit, DEFAULT_GRID_POINTS, MIN_GRID_POINTS, MAX_GRID_POINTS } from './node-evaluate';
export type { NodeEvaluation, NodePoint, NodeExtreme, NodeWorst, NoiseExtreme, PositionAtWorst } from './node-evaluate';
export { faultExcursion, UNCLAMPED_BEYOND_V } from './fault';
export type { FaultExcursion } from './fault';
export { noisePower, noiseDensity, noiseIsApproximate, NOISE_APPROXIMATION_NOTE } from './noise';
export { evenGrid, refineMaximum } from './maximize';
export { NODE_PRESETS, NODE_PRESET_KEYS } from './node-presets';
export type { NodePreset, NodePresetKey } from './node-presets';
export { summarizeNode } from './node-summary';
export type { NodeSummary, NodeSummaryOptions, FaultAtEnds } from './node-summary';
export { nodeFlags, NODE_FLAG_CODES, NODE_FLAG_WORDS, NODE_LIMIT_FLAGS, CONDUCTING_NVT, ERROR_SHIFT_FRACTION } from './node-limits';
export type { NodeLimits, NodeFlagCode, NodeFigures } from './node-limits';
export { rankNode, nodeRankRows, candidateCircuit, NODE_RANK_BY, RANK_GRID_POINTS } from './node-rank';
export type { NodeRankRequest, NodeRankResult, NodeRankedPart, NodeRankBy, RankPosition } from './node-rank';
export type { Judged } from './node-summary';
