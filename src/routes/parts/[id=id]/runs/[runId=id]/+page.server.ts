import { fail } from '@sveltejs/kit';
import { requirePermission } from '$lib/server/guards';
import { DomainError, pageError } from '$lib/server/errors';
import * as catalogue from '$lib/server/catalogue';
import * as runChanges from '$lib/server/run-changes';
import { currentMagnitude, type StoredModel } from '$lib/catalogue/models';
import { capacitanceCurve, capacitanceResiduals, type CapacitanceModel } from '$lib/catalogue/capacitance';
import { availableRunActions } from '$lib/run-transitions';
import { correctionFromForm, reinstateSchema, refitFromForm, withdrawSchema } from '$lib/schemas/runs';
import type { Actions, PageServerLoad, RequestEvent } from './$types';

const ids = (event: RequestEvent) => ({ partId: Number(event.params.id), runId: Number(event.params.runId) });

export const load: PageServerLoad = async (event) => {
	const user = requirePermission(event, 'catalogue:read');
	const { partId, runId } = ids(event);
	const run = await runChanges.runDetail(partId, runId).catch(pageError);
	const part = await catalogue.get(partId);
	// The latest fit versions, each drawn at the temperature it was fitted at, over the measured span.
	const vs = run.points.map((p) => p[0]);
	const lo = Math.min(...vs);
	const hi = Math.max(...vs);
	const cv = run.measurement === 'cv';
	const curve = (model: StoredModel | CapacitanceModel, t: number) =>
		cv
			? capacitanceCurve(model as CapacitanceModel, lo, hi, 121)
			: Array.from({ length: 121 }, (_, k) => lo + ((hi - lo) * k) / 120)
					.map((v) => ({ x: v, y: currentMagnitude(model as StoredModel, part!.material, v, t) }))
					.filter((p) => p.y > 0);
	const curves = run.fits.slice(0, 3).map((f) => ({ version: f.version, current: f.current, points: curve(f.model, f.range.temperatureC) }));
	const fit = run.fit;
	const residuals =
		cv && fit ? capacitanceResiduals(run.points, { model: fit.model as CapacitanceModel, excludedV: fit.excludedV, strayCapacitanceF: fit.strayCapacitanceF ?? 0 }) : [];
	return {
		run,
		curves,
		residuals,
		partModelVersion: part!.modelVersion,
		actions: availableRunActions(user, run.state)
	};
};

/** Form field of each domain issue path, where the two differ. */
const FIELD_OF: Record<string, string> = { temperatureC: 'temperature' };

type Parsed<T> = { input?: T; errors: Record<string, string> };
type Change = Awaited<ReturnType<typeof runChanges.withdraw>>;

/**
 * One form action: read the named fields, parse them, make the change as the signed-in
 * librarian, and answer with what happened or the refusal beside the field it names.
 */
function action<K extends string, T>(
	form: string,
	keys: readonly K[],
	parse: (values: Record<K, string>) => Parsed<T>,
	change: (user: App.User, partId: number, runId: number, input: T) => Promise<Change>,
	done: (r: Change) => string
) {
	return async (event: RequestEvent) => {
		const user = requirePermission(event, 'catalogue:write');
		const fd = await event.request.formData();
		const values = Object.fromEntries(keys.map((k) => [k, String(fd.get(k) ?? '')])) as Record<K, string>;
		const { input, errors } = parse(values);
		if (input === undefined) return fail(400, { form, values, errors });
		try {
			const { partId, runId } = ids(event);
			const r = await change(user, partId, runId, input);
			return { form, done: `${done(r)} ${r.modelVersion ? `The part's model is now version ${r.modelVersion}.` : 'The part now has no model.'}` };
		} catch (e) {
			if (!(e instanceof DomainError)) throw e;
			const path = e.issues?.[0]?.path;
			const key = path ? (FIELD_OF[path] ?? path) : 'form';
			return fail(e.status, { form, values, errors: { [key in values ? key : 'form']: e.message } as Record<string, string> });
		}
	};
}

/** A reason-only form read with its schema. */
const reasonOnly =
	(schema: typeof withdrawSchema | typeof reinstateSchema) =>
	(v: { reason: string }): Parsed<string> => {
		const r = schema.safeParse(v);
		return r.success ? { input: r.data.reason, errors: {} } : { errors: { reason: r.error.issues[0].message } };
	};

export const actions: Actions = {
	withdraw: action('withdraw', ['reason'] as const, reasonOnly(withdrawSchema), runChanges.withdraw, () => 'Run withdrawn.'),
	reinstate: action('reinstate', ['reason'] as const, reasonOnly(reinstateSchema), runChanges.reinstate, () => 'The run counts again.'),
	refit: action(
		'refit',
		['fromV', 'toV', 'stray', 'reason'] as const,
		refitFromForm,
		(user, partId, runId, input) => runChanges.refit(user, partId, runId, { excludeV: input.excludeV ?? null, reason: input.reason, strayCapacitanceF: input.strayCapacitanceF }),
		(r) => `Fit version ${r.fit?.version} made.`
	),
	correct: action('correct', ['sample', 'temperature', 'reason'] as const, correctionFromForm, runChanges.correct, (r) => `Correction recorded as fit version ${r.fit?.version}.`)
};
