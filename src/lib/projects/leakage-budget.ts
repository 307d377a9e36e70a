/**
 * The worst leakage a requirement allows [A]: the leakage target, or the allowed error
 * voltage across the source resistance, I = V / R (1 mV across 1 GΩ allows 1 pA); null
 * when neither is stated.
 */
export function leakageBudget(r: { leakageTargetA?: number; allowedErrorV?: number; sourceResistanceOhm?: number }): number | null {
	if (r.leakageTargetA !== undefined) return r.leakageTargetA;
	if (r.allowedErrorV !== undefined && r.sourceResistanceOhm !== undefined && r.sourceResistanceOhm > 0) return r.allowedErrorV / r.sourceResistanceOhm;
	return null;
}
