import { DataTypes, type QueryInterface } from 'sequelize';

const id = { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true };
const fk = (table: string) => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: table, key: 'id' }, onDelete: 'CASCADE' });
const stamps = { createdAt: { type: DataTypes.DATE, allowNull: false }, updatedAt: { type: DataTypes.DATE, allowNull: false } };

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('suppliers', {
    id,
    organisationId: fk('organisations'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    contactName: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
    email: { type: DataTypes.STRING(254), allowNull: false },
    phone: { type: DataTypes.STRING(40), allowNull: false, defaultValue: '' },
    leadTimeDays: { type: DataTypes.DOUBLE, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    archivedAt: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
  await qi.createTable('inputs', {
    id,
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    name: { type: DataTypes.STRING(120), allowNull: false },
    unit: { type: DataTypes.STRING(30), allowNull: false },
    category: { type: DataTypes.ENUM('fertilizer', 'pest-control', 'culture-starter', 'amendment', 'other'), allowNull: false },
    supplierId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true, references: { model: 'suppliers', key: 'id' }, onDelete: 'SET NULL' },
    leadTimeDays: { type: DataTypes.DOUBLE, allowNull: true },
    serviceLevel: { type: DataTypes.DOUBLE, allowNull: false },
    orderCost: { type: DataTypes.DOUBLE, allowNull: false },
    holdingCostPerYear: { type: DataTypes.DOUBLE, allowNull: false },
    unitPrice: { type: DataTypes.DOUBLE, allowNull: false },
    packSize: { type: DataTypes.DOUBLE, allowNull: false },
    minimumOrder: { type: DataTypes.DOUBLE, allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    archivedAt: { type: DataTypes.DATE, allowNull: true },
    ...stamps,
  });
  await qi.addIndex('inputs', ['organisationId', 'farmId']);
  await qi.createTable('purchase_orders', {
    id,
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    supplierId: fk('suppliers'),
    number: { type: DataTypes.STRING(20), allowNull: false },
    status: { type: DataTypes.ENUM('draft', 'sent', 'part-received', 'received', 'cancelled'), allowNull: false },
    notes: { type: DataTypes.TEXT, allowNull: false },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    ...stamps,
  });
  await qi.addIndex('purchase_orders', ['organisationId', 'number'], { unique: true, name: 'purchase_orders_number' });
  await qi.createTable('purchase_order_lines', {
    id,
    orderId: fk('purchase_orders'),
    inputId: fk('inputs'),
    quantity: { type: DataTypes.DOUBLE, allowNull: false },
    unitPrice: { type: DataTypes.DOUBLE, allowNull: false },
    receivedQuantity: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
  });
  await qi.createTable('stock_movements', {
    id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: fk('organisations'),
    farmId: fk('farms'),
    inputId: fk('inputs'),
    kind: { type: DataTypes.ENUM('receipt', 'use', 'count', 'adjustment'), allowNull: false },
    quantity: { type: DataTypes.DOUBLE, allowNull: false },
    at: { type: DataTypes.DATE(3), allowNull: false },
    reason: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
    orderId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    orderLineId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    brewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    byUserId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
    createdAt: { type: DataTypes.DATE(3), allowNull: false },
  });
  await qi.addIndex('stock_movements', ['inputId', 'at']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const t of ['stock_movements', 'purchase_order_lines', 'purchase_orders', 'inputs', 'suppliers']) await qi.dropTable(t);
}
