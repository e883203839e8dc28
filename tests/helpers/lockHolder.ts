/**
 * A server instance that hangs while it holds a sketch's row lock, in a process of its own so a
 * test can freeze it (SIGSTOP): it opens the database the way the server does (same pool, same
 * session settings), starts an edit batch through the edit log's own repository call, prints
 * "locked" once the row is locked, and never finishes the batch.
 *
 * argv: database URL, sketch id, user id (an editor of the sketch's team).
 */
import { openDatabase } from '../../server/db/client.ts';
import { editSketchAtomically } from '../../server/realtime/repository.ts';

const [url, sketchId, userId] = process.argv.slice(2);
const database = openDatabase(url!, { max: 1, log: (l) => console.error(l) });
await editSketchAtomically(database.db, sketchId!, { opIds: ['hung-op'], userIds: [userId!], cachedRevision: null }, async () => {
  console.log('locked');
  // Stuck between statements of its transaction, as a frozen process is.
  return new Promise(() => {});
});
