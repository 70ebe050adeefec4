import { DataTypes, type QueryInterface } from 'sequelize';

// The one-time set-up link of a server with no organisation: only the SHA-256 hash of its token,
// in the database so every server process of the machine sees the same live link.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('setup_tokens', {
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false, primaryKey: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('setup_tokens');
}
