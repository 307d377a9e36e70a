// The node screen without JavaScript: a GET form that evaluates on the server, row edits as
// submitted buttons, errors beside their fields, and saving the node to a project.
import { describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { projects } from '$lib/server/db/schema';
import { presetFields, queryFromFields } from '$lib/node/node-fields';
import { browse, unique } from './helpers';

describe('the node screen', () => {
	test('shows a preset ready to edit, and the figures once every position names a part', async () => {
		const preset = await browse('/node?preset=guard-pair', { as: 'librarian' });
		expect(preset.status).toBe(200);
		expect(preset.text).toContain('Back-to-back to the guard');
		expect(preset.text).toContain('Rank candidates');
		const f = presetFields('rail-pair');
		f.positions.forEach((p) => (p.part = 'HRB-D10'));
		const r = await browse(`/node?${queryFromFields(f)}`, { as: 'designer' });
		expect(r.status).toBe(200);
		expect(r.text).toContain('data-testid="node-figures"');
		expect(r.text).toMatch(/Worst net current/);
		expect(r.text).toMatch(/above VPOS/);
	});

	test('ranks the catalogue when a position is a candidate, on the basis and order chosen', async () => {
		const f = presetFields('rail-pair');
		const r = await browse(`/node?${queryFromFields(f)}`, { as: 'designer' });
		expect(r.status).toBe(200);
		expect(r.text).toContain('data-testid="node-ranking"');
		expect(r.text).toContain('Ranked by statistical bound');
		expect(r.text).toContain('HRB-D10');
		const byNoise = await browse(`/node?${queryFromFields({ ...f, basis: 'typical', by: 'noise' })}`, { as: 'designer' });
		expect(byNoise.text).toMatch(/Ranked by typical \(median\) sample, current noise/);
		const none = await browse(`/node?${queryFromFields({ ...f, q: 'no-such-part-anywhere' })}`, { as: 'lead' });
		expect(none.text).toContain('No catalogue part matches the candidate filters.');
	});

	test('adds and drops rows through the submitted edit, and names the field that is wrong', async () => {
		const f = presetFields('rail-pair');
		const added = await browse(`/node?${queryFromFields(f)}&edit=add-rail`, { as: 'designer' });
		expect(added.text.match(/name="rn"/g)).toHaveLength(3);
		f.positions[0].cathode = 'VCC';
		f.sigLo = 'minus two';
		const bad = await browse(`/node?${queryFromFields(f)}`, { as: 'designer' });
		expect(bad.status).toBe(200);
		expect(bad.text).toContain('Expected a voltage');
		const unknown = presetFields('rail-pair');
		unknown.positions[0].cathode = 'VCC';
		const u = await browse(`/node?${queryFromFields(unknown)}`, { as: 'designer' });
		expect(u.text).toContain('No rail is called “VCC”');
	});

	test('saves the node as a new project’s requirement, the operating point taken from it', async () => {
		const name = unique('rail pair project');
		const r = await browse('/node?/save', { as: 'designer', form: { query: queryFromFields(presetFields('rail-pair')), project: 'new', name } });
		expect(r.status).toBe(303);
		const id = Number(r.location?.split('/').pop());
		const [p] = await db.select().from(projects).where(eq(projects.id, id));
		expect(p.name).toBe(name);
		// Rails ±5 V, signal ±2 V: the candidates see at most 7 V reverse.
		expect(p.requirement).toMatchObject({ biasV: -7, temperatureRangeC: [0, 70], clampCurrentA: 0.01, sourceResistanceOhm: 1e9 });
		expect(p.requirement.node?.junctions.every((j) => j.candidate)).toBe(true);
		const page = await browse(`/projects/${id}`, { as: 'lead' });
		expect(page.text).toContain('In the protected node');
	});

	test('refuses to save an incomplete node or a project that is not open', async () => {
		const f = presetFields('rail-pair');
		f.sigHi = '';
		const r = await browse('/node?/save', { as: 'designer', form: { query: queryFromFields(f), project: 'new', name: unique('x') } });
		expect(r.status).toBe(400);
		const none = await browse('/node?/save', { as: 'designer', form: { query: queryFromFields(presetFields('rail-pair')), project: '999999' } });
		expect(none.status).toBe(404);
	});
});
