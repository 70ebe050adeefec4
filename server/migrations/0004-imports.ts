import { DataTypes, type QueryInterface } from 'sequelize';

const fk = (table: string, allowNull = false) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull, references: { model: table, key: 'id' }, onDelete: allowNull ? 'SET NULL' : 'CASCADE' });
const status = { type: DataTypes.ENUM('queued', 'importing', 'imported', 'rejected', 'failed', 'duplicate'), allowNull: false };
const policy = { type: DataTypes.ENUM('reject-file', 'valid-rows'), allowNull: false };

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('logger_imports', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    tankId: fk('tanks'),
    uploadedById: fk('users', true),
    originalName: { type: DataTypes.STRING(255), allowNull: false },
    storedName: { type: DataTypes.STRING(80), allowNull: false },
    sizeBytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false },
    sha256: { type: DataTypes.CHAR(64), allowNull: false },
    mapping: { type: DataTypes.JSON, allowNull: false },
    policy,
    status,
    delimiter: { type: DataTypes.STRING(4), allowNull: true },
    rowsTotal: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    rowsNew: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    rowsDuplicate: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    rowsRejected: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    error: { type: DataTypes.STRING(500), allowNull: true },
    duplicateOfId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    createdAt: { type: DataTypes.DATE(3), allowNull: false },
    startedAt: { type: DataTypes.DATE(3), allowNull: true },
    finishedAt: { type: DataTypes.DATE(3), allowNull: true },
  });
  // The same file for the same tank is found by its content hash (a re-upload is a duplicate).
  await qi.addIndex('logger_imports', ['tankId', 'sha256']);
  await qi.addIndex('logger_imports', ['organisationId', 'farmId', 'createdAt']);
  await qi.addIndex('logger_imports', ['status']);
  await qi.createTable('logger_import_rejections', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    importId: fk('logger_imports'),
    line: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    field: { type: DataTypes.ENUM('timestamp', 'value', 'temperature'), allowNull: false },
    columnLabel: { type: DataTypes.STRING(120), allowNull: false },
    value: { type: DataTypes.STRING(200), allowNull: false },
    reason: { type: DataTypes.STRING(400), allowNull: false },
  });
  await qi.addIndex('logger_import_rejections', ['importId', 'id']);
  await qi.createTable('tank_import_mappings', {
    tankId: { ...fk('tanks'), primaryKey: true },
    organisationId: fk('organisations'),
    mapping: { type: DataTypes.JSON, allowNull: false },
    policy,
    savedById: fk('users', true),
    savedAt: { type: DataTypes.DATE(3), allowNull: false },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['tank_import_mappings', 'logger_import_rejections', 'logger_imports']) await qi.dropTable(t);
}
