import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import { ORDER_STATUSES, type InputCategory, type OrderStatus } from '@shared/schemas';

// Factories, not shared objects: Sequelize writes into each attribute definition.
const id = () => ({ type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true });
const ref = () => ({ type: DataTypes.INTEGER.UNSIGNED, allowNull: false });

export class Supplier extends Model<InferAttributes<Supplier>, InferCreationAttributes<Supplier>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare name: string;
  declare contactName: string;
  declare email: string;
  declare phone: string;
  declare leadTimeDays: number;
  declare notes: string;
  declare archivedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    Supplier.init(
      {
        id: id(),
        organisationId: ref(),
        name: { type: DataTypes.STRING(120), allowNull: false },
        contactName: { type: DataTypes.STRING(120), allowNull: false, defaultValue: '' },
        email: { type: DataTypes.STRING(254), allowNull: false },
        phone: { type: DataTypes.STRING(40), allowNull: false, defaultValue: '' },
        leadTimeDays: { type: DataTypes.DOUBLE, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'suppliers' },
    );
  }
}

/** A purchased material stocked on one farm; its stock is the sum of its movements, never edited. */
export class Input extends Model<InferAttributes<Input>, InferCreationAttributes<Input>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare name: string;
  declare unit: string;
  declare category: InputCategory;
  declare supplierId: number | null;
  declare leadTimeDays: number | null;
  declare serviceLevel: number;
  declare orderCost: number;
  declare holdingCostPerYear: number;
  declare unitPrice: number;
  declare packSize: number;
  declare minimumOrder: number;
  declare notes: string;
  declare archivedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    Input.init(
      {
        id: id(),
        organisationId: ref(),
        farmId: ref(),
        name: { type: DataTypes.STRING(120), allowNull: false },
        unit: { type: DataTypes.STRING(30), allowNull: false },
        category: { type: DataTypes.ENUM('fertilizer', 'pest-control', 'culture-starter', 'amendment', 'other'), allowNull: false },
        supplierId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        leadTimeDays: { type: DataTypes.DOUBLE, allowNull: true },
        serviceLevel: { type: DataTypes.DOUBLE, allowNull: false },
        orderCost: { type: DataTypes.DOUBLE, allowNull: false },
        holdingCostPerYear: { type: DataTypes.DOUBLE, allowNull: false },
        unitPrice: { type: DataTypes.DOUBLE, allowNull: false },
        packSize: { type: DataTypes.DOUBLE, allowNull: false },
        minimumOrder: { type: DataTypes.DOUBLE, allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        archivedAt: { type: DataTypes.DATE, allowNull: true },
      },
      { sequelize, tableName: 'inputs' },
    );
  }
}

export class StockMovement extends Model<InferAttributes<StockMovement>, InferCreationAttributes<StockMovement>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare inputId: number;
  declare kind: 'receipt' | 'use' | 'count' | 'adjustment';
  declare quantity: number;
  declare at: Date;
  declare reason: string;
  declare orderId: number | null;
  declare orderLineId: number | null;
  declare brewId: number | null;
  declare byUserId: number | null;
  declare createdAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    StockMovement.init(
      {
        id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: ref(),
        farmId: ref(),
        inputId: ref(),
        kind: { type: DataTypes.ENUM('receipt', 'use', 'count', 'adjustment'), allowNull: false },
        quantity: { type: DataTypes.DOUBLE, allowNull: false },
        at: { type: DataTypes.DATE(3), allowNull: false },
        reason: { type: DataTypes.STRING(300), allowNull: false, defaultValue: '' },
        orderId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        orderLineId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        brewId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        byUserId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE(3),
      },
      { sequelize, tableName: 'stock_movements', updatedAt: false },
    );
  }
}

export class PurchaseOrder extends Model<InferAttributes<PurchaseOrder>, InferCreationAttributes<PurchaseOrder>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare supplierId: number;
  declare number: string;
  declare status: OrderStatus;
  declare notes: string;
  declare sentAt: Date | null;
  declare createdById: number | null;
  declare closedShortAt: CreationOptional<Date | null>;
  declare closedShortReason: CreationOptional<string | null>;
  declare closedShortById: CreationOptional<number | null>;
  declare createdAt: CreationOptional<Date>;
  declare updatedAt: CreationOptional<Date>;

  static initModel(sequelize: Sequelize) {
    PurchaseOrder.init(
      {
        id: id(),
        organisationId: ref(),
        farmId: ref(),
        supplierId: ref(),
        number: { type: DataTypes.STRING(20), allowNull: false },
        status: { type: DataTypes.ENUM(...ORDER_STATUSES), allowNull: false },
        notes: { type: DataTypes.TEXT, allowNull: false },
        sentAt: { type: DataTypes.DATE, allowNull: true },
        createdById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        closedShortAt: { type: DataTypes.DATE, allowNull: true },
        closedShortReason: { type: DataTypes.STRING(300), allowNull: true },
        closedShortById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE,
        updatedAt: DataTypes.DATE,
      },
      { sequelize, tableName: 'purchase_orders' },
    );
  }
}

export class PurchaseOrderLine extends Model<InferAttributes<PurchaseOrderLine>, InferCreationAttributes<PurchaseOrderLine>> {
  declare id: CreationOptional<number>;
  declare orderId: number;
  declare inputId: number;
  declare quantity: number;
  declare unitPrice: number;
  declare receivedQuantity: CreationOptional<number>;

  static initModel(sequelize: Sequelize) {
    PurchaseOrderLine.init(
      {
        id: id(),
        orderId: ref(),
        inputId: ref(),
        quantity: { type: DataTypes.DOUBLE, allowNull: false },
        unitPrice: { type: DataTypes.DOUBLE, allowNull: false },
        receivedQuantity: { type: DataTypes.DOUBLE, allowNull: false, defaultValue: 0 },
      },
      { sequelize, tableName: 'purchase_order_lines', timestamps: false },
    );
  }
}
