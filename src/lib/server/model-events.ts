import { sql } from 'drizzle-orm';
import type { DbOrTx } from './db';

/** PostgreSQL channel on which every change to a part's predictions is announced. */
export const MODEL_CHANNEL = 'junction_models';

/** PostgreSQL channel on which every committed change to a project is announced (payload: its id). */
export const PROJECT_CHANNEL = 'junction_projects';

/**
 * Announces that a part's model changed. Sent inside the writer's transaction, so
 * listeners (each app process's model cache) hear of it only once it has committed.
 */
export async function notifyModelChanged(tx: DbOrTx, partId: number) {
	await tx.execute(sql`select pg_notify(${MODEL_CHANNEL}, ${String(partId)})`);
}

/** Announces that a project changed; like the model notice, heard only once `tx` commits. */
export async function notifyProjectChanged(tx: DbOrTx, projectId: number | string) {
	await tx.execute(sql`select pg_notify(${PROJECT_CHANNEL}, ${String(projectId)})`);
}
