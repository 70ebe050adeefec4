import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const fk = (table: string) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: table, key: 'id' }, onDelete: 'CASCADE' });
const contents = { type: DataTypes.ENUM('water', 'fertilizer', 'pest-solution', 'culture'), allowNull: false };

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('tanks', {
    id,
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    name: { type: DataTypes.STRING(80), allowNull: false },
    code: { type: DataTypes.STRING(12), allowNull: false },
    contents,
    contentsNote: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    geometry: { type: DataTypes.JSON, allowNull: false },
    datumOffsetMm: { type: DataTypes.DOUBLE, allowNull: false },
    outletHeightMm: { type: DataTypes.DOUBLE, allowNull: false },
    safeFillLevelMm: { type: DataTypes.DOUBLE, allowNull: false },
    lowStockL: { type: DataTypes.DOUBLE, allowNull: false },
    specificGravity: { type: DataTypes.DOUBLE, allowNull: false },
    sensorHeightMm: { type: DataTypes.DOUBLE, allowNull: true },
    walkOrder: { type: DataTypes.INTEGER, allowNull: false, defaultValue: 0 },
    calibrationVersion: { type: DataTypes.STRING(32), allowNull: false },
    archivedAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('tanks', ['farmId', 'code'], { unique: true, name: 'tanks_farm_code' });
  await qi.addIndex('tanks', ['organisationId', 'farmId']);
  await qi.createTable('tank_calibrations', {
    id,
    organisationId: fk('organisations'),
    tankId: fk('tanks'),
    version: { type: DataTypes.STRING(32), allowNull: false },
    geometry: { type: DataTypes.JSON, allowNull: false },
    datumOffsetMm: { type: DataTypes.DOUBLE, allowNull: false },
    createdAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('tank_calibrations', ['tankId', 'version'], { unique: true, name: 'tank_calibrations_version' });
  await qi.createTable('tank_contents_periods', {
    id,
    organisationId: fk('organisations'),
    tankId: fk('tanks'),
    contents,
    contentsNote: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    specificGravity: { type: DataTypes.DOUBLE, allowNull: false },
    fromAt: { type: DataTypes.DATE(3), allowNull: false },
    toAt: { type: DataTypes.DATE(3), allowNull: true },
    changedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
  });
  await qi.addIndex('tank_contents_periods', ['tankId', 'fromAt']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['tank_contents_periods', 'tank_calibrations', 'tanks']) await qi.dropTable(t);
}
