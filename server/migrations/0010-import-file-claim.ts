import type { QueryInterface } from 'sequelize';

// One live import per file and tank, kept by the database itself: a generated column holds the file's
// hash while an import of it is queued, importing or imported (NULL otherwise, and NULLs never clash),
// and a unique index on (tank, that column) refuses a second live import of the same bytes. Two
// uploads of one file at the same moment therefore cannot both import it; failed, rejected and
// duplicate records keep no claim, so a failed import can be retried.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query(
    "ALTER TABLE logger_imports ADD COLUMN liveSha256 CHAR(64) AS (IF(status IN ('queued', 'importing', 'imported'), sha256, NULL)) PERSISTENT",
  );
  await qi.addIndex('logger_imports', ['tankId', 'liveSha256'], { unique: true, name: 'logger_imports_live_file' });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeIndex('logger_imports', 'logger_imports_live_file');
  await qi.removeColumn('logger_imports', 'liveSha256');
}
