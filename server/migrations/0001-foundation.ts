import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const fk = (table: string, onDelete = 'CASCADE') => ({
  type: DataTypes.INTEGER.UNSIGNED,
  allowNull: false,
  references: { model: table, key: 'id' },
  onDelete,
});
const stamps = { createdAt: { type: DataTypes.DATE, allowNull: false }, updatedAt: { type: DataTypes.DATE, allowNull: false } };

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('organisations', { id, name: { type: DataTypes.STRING(160), allowNull: false }, ...stamps });
  await qi.createTable('users', {
    id,
    organisationId: fk('organisations'),
    email: { type: DataTypes.STRING(254), allowNull: false, unique: true },
    name: { type: DataTypes.STRING(120), allowNull: false },
    role: { type: DataTypes.ENUM('owner', 'manager', 'worker', 'buyer'), allowNull: false },
    passwordHash: { type: DataTypes.STRING(100), allowNull: true },
    active: { type: DataTypes.BOOLEAN, allowNull: false, defaultValue: true },
    unitSystem: { type: DataTypes.ENUM('metric', 'us'), allowNull: false, defaultValue: 'metric' },
    lastSignInAt: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
  await qi.createTable('farms', {
    id,
    organisationId: fk('organisations'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    timeZone: { type: DataTypes.STRING(64), allowNull: false },
    location: { type: DataTypes.STRING(200), allowNull: false, defaultValue: '' },
    archivedAt: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
  await qi.addIndex('farms', ['organisationId']);
  await qi.createTable('farm_access', {
    userId: { ...fk('users'), primaryKey: true },
    farmId: { ...fk('farms'), primaryKey: true },
    organisationId: fk('organisations'),
  });
  await qi.createTable('sessions', {
    sid: { type: DataTypes.STRING(64), primaryKey: true },
    expires: { type: DataTypes.DATE, allowNull: true },
    data: { type: DataTypes.TEXT, allowNull: true },
    userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ...stamps,
  });
  await qi.addIndex('sessions', ['userId']);
  await qi.addIndex('sessions', ['expires']);
  await qi.createTable('auth_tokens', {
    id,
    organisationId: fk('organisations'),
    userId: fk('users'),
    purpose: { type: DataTypes.ENUM('invite', 'reset'), allowNull: false },
    tokenHash: { type: DataTypes.CHAR(64), allowNull: false, unique: true },
    expiresAt: { type: DataTypes.DATE, allowNull: false },
    usedAt: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['auth_tokens', 'sessions', 'farm_access', 'farms', 'users', 'organisations']) await qi.dropTable(t);
}
