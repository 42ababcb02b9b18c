import { mkdirSync } from 'node:fs';
import path from 'node:path';
import { Sequelize, Transaction } from 'sequelize';
import sqlite3 from 'sqlite3';
import { SequelizeStorage, Umzug } from 'umzug';
import { initAuditEvent } from './audit/audit-event.model.ts';
import { Attachment, initAttachment } from './attachments/attachment.model.ts';
import { MIGRATIONS } from './migrations/index.ts';
import { Review, initReview } from './revisions/review.model.ts';
import { Revision, initRevision } from './revisions/revision.model.ts';
import { Site, initSite } from './sites/site.model.ts';
import { User, initUser } from './users/user.model.ts';

/** How long a connection waits for another process's write lock (replicas, a backup). */
const BUSY_TIMEOUT_MS = 10_000;

export interface Database {
  sequelize: Sequelize;
  file: string;
  /**
   * Runs `fn` in one IMMEDIATE transaction: the write lock is taken at BEGIN, so what `fn`
   * reads cannot change before it commits. Writes of this process also queue here, one at a
   * time, so that transactions waiting for the lock never tie up every worker thread of sqlite3.
   */
  write<T>(fn: (t: Transaction) => Promise<T>): Promise<T>;
  /**
   * One row of a read outside any transaction, straight from sqlite3 on the shared connection:
   * for the lookups every request makes, which Sequelize's query path (a model build and a
   * formatted stack trace per statement) would cost more than the SQL itself. Values come back
   * as SQLite stores them (booleans as 0/1, dates as text).
   */
  get<T>(sql: string, params: unknown[]): Promise<T | undefined>;
  close(): Promise<void>;
}

function defineModels(sequelize: Sequelize) {
  initUser(sequelize);
  initSite(sequelize);
  initRevision(sequelize);
  initReview(sequelize);
  initAuditEvent(sequelize);
  initAttachment(sequelize);

  // constraints: false: the schema comes from the migrations, not from these associations.
  const loose = { constraints: false };
  Revision.belongsTo(User, { as: 'author', foreignKey: 'authorId', ...loose });
  Revision.belongsTo(Site, { as: 'site', foreignKey: 'siteId', ...loose });
  Revision.hasMany(Review, { as: 'reviews', foreignKey: 'revisionId', ...loose });
  Review.belongsTo(User, { as: 'reviewer', foreignKey: 'reviewerId', ...loose });
  Site.belongsTo(Revision, { as: 'latestRevision', foreignKey: 'latestRevisionId', ...loose });
  Site.belongsTo(Revision, { as: 'approvedRevision', foreignKey: 'approvedRevisionId', ...loose });
  Site.belongsTo(User, { as: 'updatedBy', foreignKey: 'updatedById', ...loose });
  Attachment.belongsTo(User, { as: 'uploadedBy', foreignKey: 'uploadedById', ...loose });
}

/**
 * Connections for statements outside transactions. Sequelize keeps just one, and SQLite runs
 * one statement at a time on a connection, so every read of the process queued behind the one
 * before it while the other core sat idle; in WAL mode readers on separate connections run side
 * by side and each sees every committed write (npm run bench, api).
 */
const READ_CONNECTIONS = 2;

type WeirConnection = sqlite3.Database & { weirReady?: boolean };

/**
 * Sequelize opens one sqlite3 connection per transaction and sets only `foreign_keys` on it;
 * every connection also needs the busy timeout, which is per connection in SQLite. Statements
 * outside a transaction take turns over READ_CONNECTIONS cached connections.
 */
function configureEachConnection(sequelize: Sequelize) {
  const manager = sequelize.connectionManager as unknown as { getConnection(options?: { uuid?: string }): Promise<WeirConnection> };
  const getConnection = manager.getConnection.bind(manager);
  let turn = 0;
  manager.getConnection = async (options?: { uuid?: string }) => {
    const shared = !options?.uuid || options.uuid === 'default';
    // A transaction's own connection is keyed by its id; the shared ones by their turn.
    const connection = await getConnection(shared ? { ...options, uuid: `default-${turn++ % READ_CONNECTIONS}` } : options);
    if (!connection.weirReady) {
      connection.weirReady = true;
      connection.configure('busyTimeout', BUSY_TIMEOUT_MS);
    }
    return connection;
  };
}

function createQueue() {
  let tail: Promise<unknown> = Promise.resolve();
  return <T>(task: () => Promise<T>): Promise<T> => {
    const run = tail.then(task, task);
    tail = run.catch(() => undefined);
    return run;
  };
}

export function createMigrator(sequelize: Sequelize) {
  return new Umzug({
    migrations: MIGRATIONS.map((m) => ({ name: m.name, up: m.up, down: m.down })),
    context: sequelize.getQueryInterface(),
    storage: new SequelizeStorage({ sequelize, tableName: 'migrations' }),
    logger: undefined,
  });
}

/** The models are classes bound to one Sequelize instance: one open database per process. */
let openFile: string | null = null;

/** Opens (creating if need be) the database file and brings its schema up to date. */
export async function openDatabase(file: string): Promise<Database> {
  if (openFile) throw new Error(`a database is open already in this process (${openFile}): close it first`);
  openFile = file;
  mkdirSync(path.dirname(file), { recursive: true });
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    dialectModule: sqlite3,
    storage: file,
    logging: false,
    // One cached connection outside transactions; transactions get their own.
    pool: { max: 1, min: 0, idle: 10_000 },
  });
  configureEachConnection(sequelize);
  defineModels(sequelize);
  try {
    // WAL: readers never wait for the writer, and the setting stays with the file.
    await sequelize.query('PRAGMA journal_mode = WAL');
    await createMigrator(sequelize).up();
  } catch (err) {
    openFile = null;
    await sequelize.close();
    throw err;
  }

  const queue = createQueue();
  return {
    sequelize,
    file,
    write: (fn) => queue(() => sequelize.transaction({ type: Transaction.TYPES.IMMEDIATE }, fn)),
    async get<T>(sql: string, params: unknown[]) {
      // The connection Sequelize keeps for statements outside transactions (set up as above).
      const manager = sequelize.connectionManager as unknown as { getConnection(options: object): Promise<WeirConnection> };
      const connection = await manager.getConnection({});
      return new Promise<T | undefined>((resolve, reject) => connection.get(sql, params, (err, row) => (err ? reject(err) : resolve(row as T | undefined))));
    },
    async close() {
      await sequelize.close();
      openFile = null;
    },
  };
}
