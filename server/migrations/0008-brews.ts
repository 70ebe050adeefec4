import { DataTypes, type QueryInterface } from 'sequelize';

const fk = (table: string) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: table, key: 'id' }, onDelete: 'CASCADE' });

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('brews', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    tankId: fk('tanks'),
    kind: { type: DataTypes.ENUM('culture', 'fertilizer', 'pest-solution'), allowNull: false },
    name: { type: DataTypes.STRING(120), allowNull: false },
    status: { type: DataTypes.ENUM('brewing', 'ready', 'used-up', 'discarded'), allowNull: false },
    startedAt: { type: DataTypes.DATE(3), allowNull: false },
    readyAt: { type: DataTypes.DATE(3), allowNull: true },
    waterL: { type: DataTypes.DOUBLE, allowNull: false },
    dilution: { type: DataTypes.JSON, allowNull: true },
    notes: { type: DataTypes.TEXT, allowNull: false },
    createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('brews', ['organisationId', 'farmId', 'startedAt']);
  await qi.createTable('brew_temperatures', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    brewId: fk('brews'),
    at: { type: DataTypes.DATE(3), allowNull: false },
    temperatureC: { type: DataTypes.DOUBLE, allowNull: false },
    byUserId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('brew_temperatures');
  await qi.dropTable('brews');
}
