import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';
import { organisationCodeCandidates } from '@shared/inventory';

// Each organisation gets a short code (2–4 letters, unique) and the ISO 4217 currency of its money
// figures; orders are numbered CODE-YY-NNN from a counter row per organisation and year, taken in the
// order's own transaction. Orders made before keep the number they were sent with (PO-00001), since
// suppliers already hold it. A part-received order can be closed short with a reason.
const STATUSES_BEFORE = ['draft', 'sent', 'part-received', 'received', 'cancelled'];
const STATUSES_AFTER = ['draft', 'sent', 'part-received', 'received', 'closed-short', 'cancelled'];

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.addColumn('organisations', 'code', { type: DataTypes.STRING(4), allowNull: true });
  // EUR until an owner sets the organisation's own currency on the People screen.
  await qi.addColumn('organisations', 'currency', { type: DataTypes.CHAR(3), allowNull: false, defaultValue: 'EUR' });
  const orgs = await qi.sequelize.query<{ id: number; name: string }>('SELECT id, name FROM organisations ORDER BY id', { type: QueryTypes.SELECT });
  const taken = new Set<string>();
  for (const org of orgs) {
    const code = organisationCodeCandidates(org.name).find((c) => !taken.has(c));
    if (!code) throw new Error(`no free organisation code for organisation ${org.id}`);
    taken.add(code);
    await qi.sequelize.query('UPDATE organisations SET code = ? WHERE id = ?', { replacements: [code, org.id], type: QueryTypes.UPDATE });
  }
  await qi.changeColumn('organisations', 'code', { type: DataTypes.STRING(4), allowNull: false });
  await qi.addIndex('organisations', ['code'], { unique: true, name: 'organisations_code' });

  await qi.createTable('order_counters', {
    organisationId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true, references: { model: 'organisations', key: 'id' }, onDelete: 'CASCADE' },
    year: { type: DataTypes.SMALLINT.UNSIGNED, allowNull: false, primaryKey: true },
    lastCount: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false },
  });

  await qi.changeColumn('purchase_orders', 'status', { type: DataTypes.ENUM(...STATUSES_AFTER), allowNull: false });
  await qi.addColumn('purchase_orders', 'closedShortAt', { type: DataTypes.DATE, allowNull: true });
  await qi.addColumn('purchase_orders', 'closedShortReason', { type: DataTypes.STRING(300), allowNull: true });
  await qi.addColumn('purchase_orders', 'closedShortById', { type: DataTypes.INTEGER.UNSIGNED, allowNull: true });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  // Plain ALTERs: the mariadb connector's results trip Sequelize's removeColumn (it deletes a read-only `meta`).
  const sql = (text: string) => qi.sequelize.query(text, { type: QueryTypes.RAW });
  await sql('ALTER TABLE purchase_orders DROP COLUMN closedShortById, DROP COLUMN closedShortReason, DROP COLUMN closedShortAt');
  // A closed-short order reads as received in the older schema: nothing more is expected on it.
  await qi.sequelize.query("UPDATE purchase_orders SET status = 'received' WHERE status = 'closed-short'", { type: QueryTypes.UPDATE });
  await qi.changeColumn('purchase_orders', 'status', { type: DataTypes.ENUM(...STATUSES_BEFORE), allowNull: false });
  await qi.dropTable('order_counters');
  await sql('ALTER TABLE organisations DROP INDEX organisations_code, DROP COLUMN currency, DROP COLUMN code');
}
