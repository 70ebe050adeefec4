import { DataTypes, QueryTypes, type QueryInterface } from 'sequelize';

// Frost ahead: each farm's place (for its hourly air forecast) and the forecast low under which its
// exposed tanks are flagged; each tank says whether it stands exposed to frost (water and fertilizer
// tanks start exposed, as most stand outdoors: common practice, no published source); the latest
// forecast of each farm is kept with how its last fetch went, so the farm page can say when it is old.
export async function up({ context: qi }: { context: QueryInterface }) {
  const sql = (text: string) => qi.sequelize.query(text, { type: QueryTypes.RAW });
  await sql('ALTER TABLE farms ADD COLUMN latitude DOUBLE NULL, ADD COLUMN longitude DOUBLE NULL, ADD COLUMN frostAheadC DOUBLE NOT NULL DEFAULT 2');
  await sql('ALTER TABLE tanks ADD COLUMN exposedToFrost TINYINT(1) NOT NULL DEFAULT 0');
  await qi.sequelize.query("UPDATE tanks SET exposedToFrost = 1 WHERE contents IN ('water', 'fertilizer')", { type: QueryTypes.UPDATE });
  await qi.createTable('farm_forecasts', {
    farmId: { type: DataTypes.INTEGER.UNSIGNED, allowNull: false, primaryKey: true, references: { model: 'farms', key: 'id' }, onDelete: 'CASCADE' },
    latitude: { type: DataTypes.DOUBLE, allowNull: true },
    longitude: { type: DataTypes.DOUBLE, allowNull: true },
    /** [{ at: ISO hour, airC }] of the last good answer. */
    hours: { type: DataTypes.JSON, allowNull: true },
    fetchedAt: { type: DataTypes.DATE(3), allowNull: true },
    triedAt: { type: DataTypes.DATE(3), allowNull: false },
    problem: { type: DataTypes.STRING(300), allowNull: true },
  });
}

export async function down({ context: qi }: { context: QueryInterface }) {
  // Plain ALTERs: the mariadb connector's results trip Sequelize's removeColumn (it deletes a read-only `meta`).
  const sql = (text: string) => qi.sequelize.query(text, { type: QueryTypes.RAW });
  await qi.dropTable('farm_forecasts');
  await qi.sequelize.query("DELETE FROM flags WHERE kind = 'frost-ahead'", { type: QueryTypes.DELETE });
  await sql('ALTER TABLE tanks DROP COLUMN exposedToFrost');
  await sql('ALTER TABLE farms DROP COLUMN frostAheadC, DROP COLUMN longitude, DROP COLUMN latitude');
}
