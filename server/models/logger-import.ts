import { DataTypes, Model, type CreationOptional, type InferAttributes, type InferCreationAttributes, type Sequelize } from 'sequelize';
import type { ImportField, ImportMapping, ImportNotice, ImportPolicy } from '@shared/imports';
import type { ImportStatus } from '@shared/schemas';

/** One uploaded logger file and what importing it did; the raw file stays in the upload folder under storedName. */
export class LoggerImport extends Model<InferAttributes<LoggerImport>, InferCreationAttributes<LoggerImport>> {
  declare id: CreationOptional<number>;
  declare organisationId: number;
  declare farmId: number;
  declare tankId: number;
  declare uploadedById: number | null;
  declare originalName: string;
  declare storedName: string;
  declare sizeBytes: number;
  declare sha256: string;
  declare mapping: ImportMapping;
  declare policy: ImportPolicy;
  declare status: ImportStatus;
  declare delimiter: string | null;
  declare rowsTotal: CreationOptional<number>;
  declare rowsNew: CreationOptional<number>;
  declare rowsDuplicate: CreationOptional<number>;
  declare rowsRejected: CreationOptional<number>;
  /** Good rows repeating an instant of the same file (rowsDuplicate: already stored by an earlier file). */
  declare rowsRepeated: CreationOptional<number>;
  /** Rows read with a notice (a local time that happens twice), and the first of those notices. */
  declare noticeCount: CreationOptional<number>;
  declare notices: CreationOptional<ImportNotice[] | null>;
  declare error: string | null;
  declare duplicateOfId: number | null;
  declare createdAt: CreationOptional<Date>;
  declare startedAt: Date | null;
  declare finishedAt: Date | null;

  static initModel(sequelize: Sequelize) {
    LoggerImport.init(
      {
        id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        tankId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        uploadedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        originalName: { type: DataTypes.STRING(255), allowNull: false },
        storedName: { type: DataTypes.STRING(80), allowNull: false },
        sizeBytes: { type: DataTypes.BIGINT.UNSIGNED, allowNull: false, get(this: LoggerImport) { return Number(this.getDataValue('sizeBytes')); } },
        sha256: { type: DataTypes.CHAR(64), allowNull: false },
        mapping: { type: DataTypes.JSON, allowNull: false },
        policy: { type: DataTypes.ENUM('reject-file', 'valid-rows'), allowNull: false },
        status: { type: DataTypes.ENUM('queued', 'importing', 'imported', 'rejected', 'failed', 'duplicate'), allowNull: false },
        delimiter: { type: DataTypes.STRING(4), allowNull: true },
        rowsTotal: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        rowsNew: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        rowsDuplicate: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        rowsRejected: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        rowsRepeated: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        noticeCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
        notices: { type: DataTypes.JSON, allowNull: true },
        error: { type: DataTypes.STRING(500), allowNull: true },
        duplicateOfId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        createdAt: DataTypes.DATE(3),
        startedAt: { type: DataTypes.DATE(3), allowNull: true },
        finishedAt: { type: DataTypes.DATE(3), allowNull: true },
      },
      { sequelize, tableName: 'logger_imports', updatedAt: false },
    );
  }
}

/** One problem of one refused row of an import (line is the 1-based physical line of the file). */
export class LoggerImportRejection extends Model<InferAttributes<LoggerImportRejection>, InferCreationAttributes<LoggerImportRejection>> {
  declare id: CreationOptional<number>;
  declare importId: number;
  declare line: number;
  declare field: ImportField;
  declare columnLabel: string;
  declare value: string;
  declare reason: string;

  static initModel(sequelize: Sequelize) {
    LoggerImportRejection.init(
      {
        id: { type: DataTypes.BIGINT.UNSIGNED, autoIncrement: true, primaryKey: true },
        importId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        line: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        field: { type: DataTypes.ENUM('timestamp', 'time', 'value', 'temperature'), allowNull: false },
        columnLabel: { type: DataTypes.STRING(120), allowNull: false },
        value: { type: DataTypes.STRING(200), allowNull: false },
        reason: { type: DataTypes.STRING(400), allowNull: false },
      },
      { sequelize, tableName: 'logger_import_rejections', timestamps: false },
    );
  }
}

/** The column mapping a tank's logger files use, saved by the last successful import. */
export class TankImportMapping extends Model<InferAttributes<TankImportMapping>, InferCreationAttributes<TankImportMapping>> {
  declare tankId: number;
  declare organisationId: number;
  declare mapping: ImportMapping;
  declare policy: ImportPolicy;
  declare savedById: number | null;
  declare savedAt: Date;

  static initModel(sequelize: Sequelize) {
    TankImportMapping.init(
      {
        tankId: { type: DataTypes.INTEGER.UNSIGNED, primaryKey: true },
        organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
        mapping: { type: DataTypes.JSON, allowNull: false },
        policy: { type: DataTypes.ENUM('reject-file', 'valid-rows'), allowNull: false },
        savedById: { type: DataTypes.INTEGER.UNSIGNED, allowNull: true },
        savedAt: { type: DataTypes.DATE(3), allowNull: false },
      },
      { sequelize, tableName: 'tank_import_mappings', timestamps: false },
    );
  }
}
