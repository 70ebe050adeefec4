import { DataTypes, type QueryInterface } from 'sequelize';

// Logger imports count good rows that repeat an instant of the same file apart from those already
// stored by an earlier file (rowsDuplicate), keep the notices on rows read in a repeated local hour
// (the first ones, and how many in all), and a refused row may be about a separate time column.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('logger_imports', 'rowsRepeated', { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
  await qi.addColumn('logger_imports', 'noticeCount', { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 });
  await qi.addColumn('logger_imports', 'notices', { type: DataTypes.JSON, allowNull: true });
  await qi.changeColumn('logger_import_rejections', 'field', { type: DataTypes.ENUM('timestamp', 'time', 'value', 'temperature'), allowNull: false });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.sequelize.query("DELETE FROM logger_import_rejections WHERE field = 'time'");
  await qi.changeColumn('logger_import_rejections', 'field', { type: DataTypes.ENUM('timestamp', 'value', 'temperature'), allowNull: false });
  for (const column of ['notices', 'noticeCount', 'rowsRepeated']) await qi.removeColumn('logger_imports', column);
}
