import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';

// An e-mail address is unique within an organisation, no longer across all of them: inviting an
// address that has an account elsewhere then works (and answers) exactly like a new address, so an
// invitation cannot tell an owner who else uses Brimstock. Sign-in looks the address up across
// organisations (plain index); password hashes get room for argon2id strings with larger parameters.
async function uniqueEmailIndexes(qi: QueryInterface): Promise<string[]> {
  const rows = await qi.sequelize.query<{ Key_name: string; Column_name: string; Non_unique: number | string; Seq_in_index: number | string }>('SHOW INDEX FROM users', { type: QueryTypes.SELECT });
  const byName = new Map<string, string[]>();
  for (const r of rows) if (Number(r.Non_unique) === 0) byName.set(r.Key_name, [...(byName.get(r.Key_name) ?? []), r.Column_name]);
  return [...byName].filter(([, columns]) => columns.length === 1 && columns[0] === 'email').map(([name]) => name);
}

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addIndex('users', ['organisationId', 'email'], { unique: true, name: 'users_organisation_email' });
  await qi.addIndex('users', ['email'], { name: 'users_email' });
  for (const name of await uniqueEmailIndexes(qi)) await qi.removeIndex('users', name);
  await qi.changeColumn('users', 'passwordHash', { type: DataTypes.STRING(255), allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.changeColumn('users', 'passwordHash', { type: DataTypes.STRING(100), allowNull: true });
  await qi.addIndex('users', ['email'], { unique: true, name: 'email' });
  await qi.removeIndex('users', 'users_email');
  await qi.removeIndex('users', 'users_organisation_email');
}
