/**
 * The instance library: instance sets, their maps and scenarios. Maps and scenarios keep the
 * uploaded bytes (bytea) so downloads are byte-for-byte, plus the parsed form for the API.
 */
import { DataTypes, literal } from 'sequelize';
import type { Migration } from '../migration';

const now = { type: DataTypes.DATE, allowNull: false, defaultValue: literal('CURRENT_TIMESTAMP') };

export const up: Migration = async ({ context: qi }) => {
  await qi.createTable('instance_sets', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    owner_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'users', key: 'id' }, onDelete: 'RESTRICT' },
    name: { type: DataTypes.STRING(120), allowNull: false },
    description: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    visibility: { type: DataTypes.ENUM('public', 'private'), allowNull: false, defaultValue: 'private' },
    source: { type: DataTypes.TEXT, allowNull: false, defaultValue: '' },
    created_at: now,
    updated_at: now,
  });
  // One person cannot hold two sets of the same name; the listing filters on visibility and owner, newest first.
  await qi.addIndex('instance_sets', ['owner_id', 'name'], { unique: true, name: 'instance_sets_owner_name' });
  await qi.addIndex('instance_sets', ['visibility', 'created_at'], { name: 'instance_sets_visibility_created' });

  await qi.createTable('maps', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    instance_set_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'instance_sets', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(255), allowNull: false },
    type: { type: DataTypes.STRING(32), allowNull: false },
    width: { type: DataTypes.INTEGER, allowNull: false },
    height: { type: DataTypes.INTEGER, allowNull: false },
    passable_count: { type: DataTypes.INTEGER, allowNull: false },
    // The map rows joined by '\n' (exactly height × width terrain characters plus separators).
    cells: { type: DataTypes.TEXT, allowNull: false },
    checksum: { type: DataTypes.CHAR(64), allowNull: false },
    byte_size: { type: DataTypes.INTEGER, allowNull: false },
    original: { type: DataTypes.BLOB, allowNull: false },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('maps', ['instance_set_id', 'name'], { unique: true, name: 'maps_set_name' });

  await qi.createTable('scenarios', {
    id: { type: DataTypes.INTEGER, autoIncrement: true, primaryKey: true },
    instance_set_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'instance_sets', key: 'id' }, onDelete: 'CASCADE' },
    map_id: { type: DataTypes.INTEGER, allowNull: false, references: { model: 'maps', key: 'id' }, onDelete: 'CASCADE' },
    name: { type: DataTypes.STRING(255), allowNull: false },
    // [bucket, startX, startY, goalX, goalY, optimalLength] per row, in file order.
    rows: { type: DataTypes.JSONB, allowNull: false },
    row_count: { type: DataTypes.INTEGER, allowNull: false },
    max_agents: { type: DataTypes.INTEGER, allowNull: false },
    checksum: { type: DataTypes.CHAR(64), allowNull: false },
    byte_size: { type: DataTypes.INTEGER, allowNull: false },
    original: { type: DataTypes.BLOB, allowNull: false },
    created_at: now,
    updated_at: now,
  });
  await qi.addIndex('scenarios', ['instance_set_id', 'name'], { unique: true, name: 'scenarios_set_name' });
  await qi.addIndex('scenarios', ['map_id'], { name: 'scenarios_map' });
};

export const down: Migration = async ({ context: qi }) => {
  await qi.dropTable('scenarios');
  await qi.dropTable('maps');
  await qi.dropTable('instance_sets');
  await qi.sequelize.query('DROP TYPE IF EXISTS "enum_instance_sets_visibility"');
};
