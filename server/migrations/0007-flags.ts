import { DataTypes, type QueryInterface } from 'sequelize';

export async function up({ context: qi }: { context: QueryInterface }) {
  // Farm settings the flag rules read (defaults: common practice, no published source).
  await qi.addColumn('farms', 'staleAfterDays', { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 3 });
  await qi.addColumn('farms', 'coldCultureC', { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 18 });
  await qi.addColumn('farms', 'frostRiskC', { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 2 });
  await qi.createTable('flags', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'farms', key: 'id' }, onDelete: 'CASCADE' },
    kind: { type: DataTypes.STRING(24), allowNull: false },
    subjectType: { type: DataTypes.ENUM('tank', 'input'), allowNull: false },
    subjectId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
    status: { type: DataTypes.ENUM('open', 'acknowledged', 'cleared'), allowNull: false },
    activeKey: { type: DataTypes.TINYINT, allowNull: true },
    message: { type: DataTypes.STRING(300), allowNull: false },
    value: { type: DataTypes.DOUBLE, allowNull: true },
    raisedAt: { type: DataTypes.DATE(3), allowNull: false },
    lastSeenAt: { type: DataTypes.DATE(3), allowNull: false },
    acknowledgedAt: { type: DataTypes.DATE(3), allowNull: true },
    acknowledgedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ackNote: { type: DataTypes.STRING(300), allowNull: true },
    clearedAt: { type: DataTypes.DATE(3), allowNull: true },
  });
  // NULLs never clash in a unique key, so cleared flags pile up as history while one active flag per subject and kind is enforced.
  await qi.addIndex('flags', ['kind', 'subjectType', 'subjectId', 'activeKey'], { unique: true, name: 'flags_one_active' });
  await qi.addIndex('flags', ['organisationId', 'farmId', 'status']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('flags');
  for (const c of ['frostRiskC', 'coldCultureC', 'staleAfterDays']) await qi.removeColumn('farms', c);
}
