import { DataTypes, type QueryInterface } from 'sequelize';

// Each person's language (en, es, fr: shared/i18n/languages.ts) for screens, mails, texts and PDFs;
// null until they choose one or first sign in, when the browser's language is stored.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('users', 'language', { type: DataTypes.STRING(8), allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query('ALTER TABLE users DROP COLUMN `language`');
}
