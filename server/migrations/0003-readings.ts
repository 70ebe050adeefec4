import { DataTypes, type QueryInterface } from 'sequelize';

const fk = (table: string) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: table, key: 'id' }, onDelete: 'CASCADE' });
const source = { type: DataTypes.ENUM('round', 'logger', 'correction'), allowNull: false };

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('readings', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    tankId: fk('tanks'),
    takenAt: { type: DataTypes.DATE(3), allowNull: false },
    source,
    revision: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    levelMm: { type: DataTypes.DOUBLE, allowNull: false },
    grossL: { type: DataTypes.DOUBLE, allowNull: false },
    usableL: { type: DataTypes.DOUBLE, allowNull: false },
    temperatureC: { type: DataTypes.DOUBLE, allowNull: true },
    calibrationVersion: { type: DataTypes.STRING(32), allowNull: false },
    enteredById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    importId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    note: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
    idempotencyKey: { type: DataTypes.STRING(64), allowNull: true },
    correctedById: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
    correctsId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: true },
    createdAt: { type: DataTypes.DATE(3), allowNull: false },
  });
  // One reading per tank, instant and source (a re-imported file adds nothing); corrections count revisions.
  await qi.addIndex('readings', ['tankId', 'takenAt', 'source', 'revision'], { unique: true, name: 'readings_natural_key' });
  await qi.addIndex('readings', ['idempotencyKey'], { unique: true, name: 'readings_idempotency' });
  await qi.addIndex('readings', ['importId']);
  await qi.createTable('tank_latest', {
    tankId: { ...fk('tanks'), primaryKey: true },
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    readingId: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    takenAt: { type: DataTypes.DATE(3), allowNull: false },
    levelMm: { type: DataTypes.DOUBLE, allowNull: false },
    grossL: { type: DataTypes.DOUBLE, allowNull: false },
    usableL: { type: DataTypes.DOUBLE, allowNull: false },
    temperatureC: { type: DataTypes.DOUBLE, allowNull: true },
    source,
  });
  await qi.addIndex('tank_latest', ['organisationId', 'farmId']);
  await qi.createTable('tank_days', {
    tankId: { ...fk('tanks'), primaryKey: true },
    day: { type: DataTypes.DATEONLY, primaryKey: true },
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    takenAt: { type: DataTypes.DATE(3), allowNull: false },
    grossL: { type: DataTypes.DOUBLE, allowNull: false },
    usableL: { type: DataTypes.DOUBLE, allowNull: false },
  });
  await qi.addIndex('tank_days', ['organisationId', 'farmId', 'day']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['tank_days', 'tank_latest', 'readings']) await qi.dropTable(t);
}
