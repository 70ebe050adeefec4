import type { QueryInterface } from 'sequelize';

// A round entry's idempotency key belongs to the person who sent it: two people (in one organisation
// or in two) may pick the same key without one's reading blocking or answering for the other's.
// Rows without a person or a key (logger files, corrections) hold NULLs, which never clash.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addIndex('readings', ['enteredById', 'idempotencyKey'], { unique: true, name: 'readings_person_idempotency' });
  await qi.removeIndex('readings', 'readings_idempotency');
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.addIndex('readings', ['idempotencyKey'], { unique: true, name: 'readings_idempotency' });
  await qi.removeIndex('readings', 'readings_person_idempotency');
}
