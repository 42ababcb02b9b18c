import { DataTypes, type QueryInterface } from 'sequelize';

// Columns are snake_case; the models map them with `underscored: true`.
const { INTEGER, STRING, TEXT, BOOLEAN, DATE, JSON } = DataTypes;
const id = { type: INTEGER, primaryKey: true, autoIncrement: true, allowNull: false };
const ref = (table: string, allowNull = false, onDelete = 'RESTRICT') => ({ type: INTEGER, allowNull, references: { model: table, key: 'id' }, onDelete });

export async function up({ context: qi }: { context: QueryInterface }) {
  await qi.createTable('users', {
    id,
    email: { type: STRING, allowNull: false, unique: true },
    name: { type: STRING, allowNull: false },
    password_hash: { type: STRING, allowNull: false },
    role: { type: STRING, allowNull: false },
    disabled: { type: BOOLEAN, allowNull: false, defaultValue: false },
    token_version: { type: INTEGER, allowNull: false, defaultValue: 0 },
    created_at: { type: DATE, allowNull: false },
    updated_at: { type: DATE, allowNull: false },
  });

  await qi.createTable('sites', {
    id: { type: STRING, primaryKey: true, allowNull: false },
    name: { type: STRING, allowNull: false },
    status: { type: STRING, allowNull: false },
    latest_state: { type: STRING, allowNull: false },
    // revisions is created next; SQLite resolves the reference when it is used.
    approved_revision_id: ref('revisions', true, 'SET NULL'),
    latest_revision_id: ref('revisions', true, 'SET NULL'),
    error_count: { type: INTEGER, allowNull: false, defaultValue: 0 },
    warning_count: { type: INTEGER, allowNull: false, defaultValue: 0 },
    updated_by_id: ref('users', true, 'SET NULL'),
    created_at: { type: DATE, allowNull: false },
    updated_at: { type: DATE, allowNull: false },
  });
  // The site list filters on status or latest state, searches by name and sorts by these.
  await qi.addIndex('sites', ['status']);
  await qi.addIndex('sites', ['latest_state']);
  await qi.addIndex('sites', ['approved_revision_id']);
  await qi.addIndex('sites', ['name']);
  await qi.addIndex('sites', ['updated_at']);
  await qi.addIndex('sites', ['error_count']);

  await qi.createTable('revisions', {
    id,
    site_id: { type: STRING, allowNull: false, references: { model: 'sites', key: 'id' }, onDelete: 'RESTRICT' },
    number: { type: INTEGER, allowNull: false },
    yaml: { type: TEXT, allowNull: false },
    sha256: { type: STRING(64), allowNull: false },
    // Declared JSON (stored as text): Sequelize's SQLite dialect parses by the declared type.
    document: { type: JSON, allowNull: false },
    findings: { type: JSON, allowNull: false },
    summary: { type: JSON, allowNull: true },
    error_count: { type: INTEGER, allowNull: false },
    warning_count: { type: INTEGER, allowNull: false },
    info_count: { type: INTEGER, allowNull: false },
    author_id: ref('users'),
    message: { type: TEXT, allowNull: true },
    parent_id: ref('revisions', true),
    state: { type: STRING, allowNull: false },
    decided_at: { type: DATE, allowNull: true },
    decided_by_id: ref('users', true),
    created_at: { type: DATE, allowNull: false },
  });
  // The same text pushed twice is one revision, even when two pushes race.
  await qi.addIndex('revisions', ['site_id', 'sha256'], { unique: true });
  await qi.addIndex('revisions', ['site_id', 'number'], { unique: true });
  await qi.addIndex('revisions', ['site_id', 'state']);

  await qi.createTable('reviews', {
    id,
    revision_id: ref('revisions'),
    reviewer_id: ref('users'),
    decision: { type: STRING, allowNull: false },
    comment: { type: TEXT, allowNull: true },
    created_at: { type: DATE, allowNull: false },
  });
  await qi.addIndex('reviews', ['revision_id']);

  // No foreign keys here: the change log must outlive anything it talks about.
  await qi.createTable('audit_events', {
    seq: { type: INTEGER, primaryKey: true, allowNull: false },
    at: { type: STRING, allowNull: false },
    actor_id: { type: INTEGER, allowNull: true },
    actor_email: { type: STRING, allowNull: true },
    action: { type: STRING, allowNull: false },
    site_id: { type: STRING, allowNull: true },
    revision_id: { type: INTEGER, allowNull: true },
    details: { type: TEXT, allowNull: false },
    prev_hash: { type: STRING(64), allowNull: false },
    hash: { type: STRING(64), allowNull: false },
  });
  await qi.addIndex('audit_events', ['site_id']);
  await qi.addIndex('audit_events', ['actor_id']);
  await qi.addIndex('audit_events', ['actor_email']);
  await qi.addIndex('audit_events', ['action']);
  await qi.addIndex('audit_events', ['at']);

  await qi.createTable('attachments', {
    id,
    site_id: { type: STRING, allowNull: false, references: { model: 'sites', key: 'id' }, onDelete: 'RESTRICT' },
    sha256: { type: STRING(64), allowNull: false },
    size: { type: INTEGER, allowNull: false },
    media_type: { type: STRING, allowNull: false },
    filename: { type: STRING, allowNull: false },
    caption: { type: TEXT, allowNull: true },
    uploaded_by_id: ref('users'),
    created_at: { type: DATE, allowNull: false },
  });
  await qi.addIndex('attachments', ['site_id']);
}

export async function down({ context: qi }: { context: QueryInterface }) {
  for (const table of ['attachments', 'audit_events', 'reviews', 'revisions', 'sites', 'users']) await qi.dropTable(table);
}
