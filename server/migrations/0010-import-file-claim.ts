import type { QueryInterface } from 'sequelize';

// One live import per file and tank, kept by the database itself: a generated column is 1 while an
// import is queued, importing or imported (NULL otherwise, and NULLs never clash in a unique index),
// and a unique index on (tank, file hash, that column) refuses a second live import of the same bytes.
// Two uploads of one file at the same moment therefore cannot both import it; failed, rejected and
// duplicate records hold no claim, so a failed import can be retried.
// (MariaDB refuses a stored generated column that reads a CHAR column, hence the flag beside sha256.)
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query("ALTER TABLE logger_imports ADD COLUMN live TINYINT AS (IF(status IN ('queued', 'importing', 'imported'), 1, NULL)) PERSISTENT");
  await qi.addIndex('logger_imports', ['tankId', 'sha256', 'live'], { unique: true, name: 'logger_imports_live_file' });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeIndex('logger_imports', 'logger_imports_live_file');
  await qi.removeColumn('logger_imports', 'live');
}
