// The new-part form takes a SPICE .model card and keeps it as the part's given model, read
// exactly as the edit page's import reads it; a card that cannot be read stops the whole
// form and writes nothing.
import { describe, expect, test } from 'vitest';
import { eq } from 'drizzle-orm';
import { db } from '$lib/server/db';
import { parts } from '$lib/server/db/schema';
import { browse, unique } from './helpers';

const base = (partNumber: string) => ({ partNumber, maker: 'Orbelle Microtech', kind: 'diode', lifecycle: 'in-use' });

describe('a new part with a .model card', () => {
	test('is created with the card as its given model and the source named', async () => {
		const pn = unique('OM').toUpperCase();
		// SPICE scale factors as the ngspice manual lists them: f = 1e-15, MEG = 1e6, m = 1e-3 (ngspice User's Manual, §2.4.1).
		const r = await browse('/parts/new', { as: 'librarian', form: { ...base(pn), card: '.model OMX D(IS=2.5f N=1.04 RS=3.2 RSH=12MEG BV=75 IBV=5u)', source: 'maker library rev C' } });
		expect(r.status, r.text.slice(0, 300)).toBe(303);
		const id = Number(r.location?.split('/').pop());
		const [part] = await db.select().from(parts).where(eq(parts.id, id));
		expect(part.partNumber).toBe(pn);
		const want: Record<string, number> = { IS: 2.5e-15, N: 1.04, RS: 3.2, RSH: 12e6, BV: 75, IBV: 5e-6 };
		const got = part.givenModel as unknown as Record<string, number>;
		expect(Object.keys(got).sort()).toEqual(Object.keys(want).sort());
		// Scale factors multiply in double precision: equal to the last bit or two.
		for (const k of Object.keys(want)) expect(Math.abs(got[k] / want[k] - 1), k).toBeLessThan(1e-15);
		expect(part.givenModelSource).toBe('maker library rev C');
		const page = await browse(`/parts/${id}`, { as: 'designer' });
		expect(page.text).toContain('Given, not measured: maker library rev C');
	});

	test('the source defaults to the card name; the edit page imports the same card to the same model', async () => {
		const card = '.model QX9 D(IS=1.2e-14 N=1.9 RS=0.05)';
		const r = await browse('/parts/new', { as: 'librarian', form: { ...base(unique('OM').toUpperCase()), card } });
		expect(r.status).toBe(303);
		const id = Number(r.location?.split('/').pop());
		const [made] = await db.select().from(parts).where(eq(parts.id, id));
		expect(made.givenModelSource).toBe('.model QX9');
		const again = await browse(`/parts/${id}/edit?/card`, { as: 'librarian', form: { card, source: '' } });
		expect(again.status).toBe(200);
		const [imported] = await db.select().from(parts).where(eq(parts.id, id));
		expect(imported.givenModel).toEqual(made.givenModel);
	});

	test('an unreadable card is refused beside the card field and nothing is created', async () => {
		const pn = unique('OM').toUpperCase();
		const r = await browse('/parts/new', { as: 'librarian', form: { ...base(pn), card: '.model BAD D(N=1.1 RS=2)' } });
		expect(r.status).toBe(400);
		expect(r.text).toContain('has no IS');
		expect(await db.select().from(parts).where(eq(parts.partNumber, pn))).toHaveLength(0);
		const wrongType = await browse('/parts/new', { as: 'librarian', form: { ...base(pn), card: '.model Q1 NPN(IS=1f BF=100)' } });
		expect(wrongType.status).toBe(400);
		expect(wrongType.text).toContain('only diode (D) models');
	});

	test('without a card the part has no model, as before', async () => {
		const pn = unique('OM').toUpperCase();
		const r = await browse('/parts/new', { as: 'librarian', form: base(pn) });
		expect(r.status).toBe(303);
		const [part] = await db.select().from(parts).where(eq(parts.partNumber, pn));
		expect(part.givenModel).toBeNull();
	});
});
