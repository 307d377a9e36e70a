import type { DbOrTx } from './db';
import { auditLog } from './db/schema';
import { notifyProjectChanged } from './model-events';

/**
 * Writes one audit row; call it inside the transaction of the change it records. Every
 * change to a project writes one, so a project's audit row is also where its change is
 * announced to open screens (same transaction: heard only once it commits).
 */
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
	if (entry.entity === 'project') await notifyProjectChanged(tx, entry.entityId);
	return row;
}
