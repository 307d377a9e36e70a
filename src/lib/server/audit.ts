import type { DbOrTx } from './db';
import { auditLog } from './db/schema';

/** Writes one audit row; call it inside the transaction of the change it records. */
export async function recordAudit(
	tx: DbOrTx,
	entry: { actorId: string | null; action: string; entity: string; entityId: string | number; detail?: Record<string, unknown> }
) {
	const [row] = await tx
		.insert(auditLog)
		.values({
			actorId: entry.actorId,
			action: entry.action,
			entity: entry.entity,
			entityId: String(entry.entityId),
			detail: entry.detail ?? {}
		})
		.returning({ id: auditLog.id });
	return row;
}
