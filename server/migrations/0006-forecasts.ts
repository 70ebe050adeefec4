import { DataTypes, type QueryInterface } from 'sequelize';

// Each tank's use rate, cached beside its latest reading and refreshed when a newer reading arrives.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('tank_latest', 'useLPerDay', { type: DataTypes.DOUBLE, allowNull: true });
  await qi.addColumn('tank_latest', 'useSdLPerDay', { type: DataTypes.DOUBLE, allowNull: true });
  await qi.addColumn('tank_latest', 'forecastAt', { type: DataTypes.DATE(3), allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const c of ['forecastAt', 'useSdLPerDay', 'useLPerDay']) await qi.removeColumn('tank_latest', c);
}
