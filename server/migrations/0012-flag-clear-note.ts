import { DataTypes, type QueryInterface } from 'sequelize';

// A temperature flag a person clears by hand keeps who did it and why.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('flags', 'clearedById', { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
  await qi.addColumn('flags', 'clearNote', { type: DataTypes.STRING(300), allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.removeColumn('flags', 'clearNote');
  await qi.removeColumn('flags', 'clearedById');
}
