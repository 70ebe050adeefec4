import { DataTypes, type QueryInterface } from 'sequelize';

// Flags by text message: each person's mobile number (E.164) and text choice, when a STOP reply
// turned their texts off, when their last daily text summary went; and the queue of texts, whose
// rows stay after sending so the daily cap can count them and the Profile can show failures.
export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('users', 'phone', { type: DataTypes.STRING(16), allowNull: true });
  await qi.addColumn('users', 'flagTexts', { type: DataTypes.ENUM('immediate', 'digest', 'off'), allowNull: false, defaultValue: 'off' });
  await qi.addColumn('users', 'textsStoppedAt', { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn('users', 'lastTextDigestAt', { type: DataTypes.DATE, allowNull: true });
  await qi.createTable('flag_texts', {
    id: { type: DataTypes.INTEGER.UNSIGNED, autoIncrement: true, primaryKey: true },
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    userId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'CASCADE' },
    toPhone: { type: DataTypes.STRING(16), allowNull: false },
    body: { type: DataTypes.STRING(320), allowNull: false },
    status: { type: DataTypes.ENUM('pending', 'sent', 'failed', 'over-cap'), allowNull: false },
    attempts: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, defaultValue: 0 },
    nextAttemptAt: { type: DataTypes.DATE, allowNull: true },
    lastError: { type: DataTypes.STRING(300), allowNull: true },
    providerSid: { type: DataTypes.STRING(64), allowNull: true },
    sentAt: { type: DataTypes.DATE, allowNull: true },
    deliveredAt: { type: DataTypes.DATE, allowNull: true },
    createdAt: { type: DataTypes.DATE, allowNull: false },
    updatedAt: { type: DataTypes.DATE, allowNull: false },
  });
  await qi.addIndex('flag_texts', ['status', 'nextAttemptAt'], { name: 'flag_texts_due' });
  await qi.addIndex('flag_texts', ['userId', 'createdAt'], { name: 'flag_texts_user_day' });
  await qi.addIndex('flag_texts', ['providerSid'], { name: 'flag_texts_provider_sid' });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  await qi.dropTable('flag_texts');
  for (const column of ['lastTextDigestAt', 'textsStoppedAt', 'flagTexts', 'phone']) await qi.sequelize.query(`ALTER TABLE users DROP COLUMN \`${column}\``);
}
