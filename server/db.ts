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
   * Runs `fn` in an IMMEDIATE transaction: the write lock is taken at BEGIN, so what `fn` reads
   * cannot change before it commits, and its changes count all together or not at all. Writes of
   * this process queue here, one transaction at a time; writes that queued up together share one
   * transaction, each in a SAVEPOINT of its own (group commit, see createWriter). `fn` may run
   * after other writes of its group in the same transaction, and sees what they changed.
   */
  write<T>(fn: (t: Transaction) => Promise<T>): Promise<T>;
  /**
   * `write` for a write that issues its last statements without awaiting them (db.sql runs them
   * in order) and returns them as `issued`: the group's next write starts meanwhile. A failure
   * of an issued statement fails the write's whole group.
   */
  writePipelined<T>(fn: (t: Transaction) => Promise<Issued<T>>): Promise<T>;
  /**
   * SQLite's `PRAGMA data_version` on a connection that never writes: it changes whenever any
   * other connection, of this process or another, has committed a change since the last call.
   * For caches of answers: one that was made at the same version is still true.
   */
  dataVersion(): Promise<number>;
  /**
   * One row and the data_version it was read at, in one statement on the connection that
   * answers `dataVersion` (read-only; statements prepared once and kept): for the lookup every
   * request makes, so that a cached answer can be checked without a second statement.
   */
  getAtVersion<T>(sql: string, params: readonly Param[]): Promise<{ row: T | undefined; dataVersion: number }>;
  /** How many writes wait for the transaction that runs now (they will share the next one). */
  queuedWrites(): number;
  /**
   * Hand-written statements straight on sqlite3, inside the transaction `t` (on its connection)
   * or, without one, on a shared read connection: for the hot paths (a push, the sites list),
   * where Sequelize's query path costs more than the SQL itself. Dates go in and come back as
   * stored text (lib/stored-date.ts), JSON as text, booleans as 0/1. Inside a transaction the
   * statements run in the order they were issued, so writes that need no answer may be issued
   * together and awaited at once: each await costs a turn of the busy event loop.
   */
  sql(t?: Transaction): Sql;
  close(): Promise<void>;
}

type Param = string | number | null;

export interface Sql {
  get<T>(sql: string, params?: readonly Param[]): Promise<T | undefined>;
  all<T>(sql: string, params?: readonly Param[]): Promise<T[]>;
  /** An INSERT, UPDATE or DELETE: the new row's id and the number of rows changed. */
  run(sql: string, params?: readonly Param[]): Promise<{ lastId: number; changes: number }>;
}

function sqlOn(connection: () => Promise<sqlite3.Database>): Sql {
  return {
    async get<T>(sql: string, params: readonly Param[] = []) {
      const c = await connection();
      return new Promise<T | undefined>((resolve, reject) => c.get(sql, params, (err, row) => (err ? reject(err) : resolve(row as T | undefined))));
    },
    async all<T>(sql: string, params: readonly Param[] = []) {
      const c = await connection();
      return new Promise<T[]>((resolve, reject) => c.all(sql, params, (err, rows) => (err ? reject(err) : resolve(rows as T[]))));
    },
    async run(sql: string, params: readonly Param[] = []) {
      const c = await connection();
      return new Promise<{ lastId: number; changes: number }>((resolve, reject) =>
        c.run(sql, params, function (this: sqlite3.RunResult, err: Error | null) {
          if (err) reject(err);
          else resolve({ lastId: this.lastID, changes: this.changes });
        }),
      );
    },
  };
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

type WeirConnection = sqlite3.Database & { weirReady?: boolean; weirWriter?: boolean };

/** The key of the one connection every write transaction of this process runs on. */
const WRITER = 'writer';

/**
 * Sequelize opens a new sqlite3 connection for every transaction and closes it at the end: each
 * write paid for opening the file, reading the schema afresh and the PRAGMAs (npm run bench,
 * api: a third of a push). Writes of this process are one at a time anyway (`write` queues
 * them), so every transaction runs on one long-lived writer connection instead, and statements
 * outside a transaction take turns over READ_CONNECTIONS cached connections. Every connection
 * gets the busy timeout, which SQLite keeps per connection.
 */
function configureEachConnection(sequelize: Sequelize, dbOptions: DatabaseOptions) {
  type Manager = {
    connections: Record<string, WeirConnection>;
    getConnection(options?: { uuid?: string }): Promise<WeirConnection>;
    releaseConnection(connection: WeirConnection, force?: boolean): void;
    destroyConnection(connection: WeirConnection): Promise<void>;
  };
  const manager = sequelize.connectionManager as unknown as Manager;
  const getConnection = manager.getConnection.bind(manager);
  const releaseConnection = manager.releaseConnection.bind(manager);
  let turn = 0;
  manager.getConnection = async (options?: { uuid?: string }) => {
    const shared = !options?.uuid || options.uuid === 'default';
    const uuid = shared ? `default-${turn++ % READ_CONNECTIONS}` : WRITER;
    const connection = await getConnection({ ...options, uuid });
    if (!connection.weirReady) {
      connection.weirReady = true;
      connection.weirWriter = !shared;
      connection.configure('busyTimeout', BUSY_TIMEOUT_MS);
      if (dbOptions.onStatement) connection.on('profile', dbOptions.onStatement);
      // The writer runs statements one after another in the order they were issued, so a
      // transaction may issue several before it awaits them (db.sql).
      if (!shared) connection.serialize();
    }
    return connection;
  };
  // The writer outlives its transactions: a finished one hands it back open.
  manager.releaseConnection = (connection, force) => {
    if (!connection.weirWriter) releaseConnection(connection, force);
  };
  // After a failed COMMIT or ROLLBACK the connection's state is unknown: close it, and the next
  // transaction opens a new writer.
  manager.destroyConnection = async (connection) => {
    if (manager.connections[WRITER] === connection) delete manager.connections[WRITER];
    await new Promise<void>((resolve) => connection.close(() => resolve()));
  };
}

/** Writes that wait while one transaction runs go together into the next, up to this many. */
const GROUP_MAX = 32;

type Outcome = { ok: true; value: unknown } | { ok: false; error: unknown };

/** What a pipelined write hands back: its answer, and its statements still running. */
export interface Issued<T> {
  value: T;
  /** The statements the write issued and did not await; if one fails, the write's whole group fails. */
  issued: Promise<unknown>;
}

interface WriteJob {
  fn: (t: Transaction) => Promise<unknown>;
  pipelined: boolean;
  resolve(value: unknown): void;
  reject(error: unknown): void;
}

/**
 * The writes of this process, one transaction at a time, with group commit: the writes that
 * queued up while a transaction ran share the next one, each inside a SAVEPOINT of its own, so
 * one failing write rolls back only itself. Nobody hears of success before the COMMIT; if the
 * COMMIT fails, every write of the group fails. A group of one runs as a plain transaction.
 * Under load this turns a BEGIN, a COMMIT and an fsync per write into one of each per group
 * (npm run bench, api: pushes at once from many clients).
 *
 * A pipelined write (a push) returns once it has issued its last statements; the next write of
 * the group starts at once, its statements queued behind them on the writer connection, so it
 * still sees them. Its statements are awaited before the COMMIT, and if one failed (they are
 * meant not to: the write checked everything it needed first) the whole group fails.
 */
function createWriter(sequelize: Sequelize) {
  const waiting: WriteJob[] = [];
  let running = false;

  const manager = sequelize.connectionManager as unknown as {
    getConnection(options: { uuid: string }): Promise<WeirConnection>;
    destroyConnection(connection: WeirConnection): Promise<void>;
  };

  async function runGroup(group: WriteJob[]) {
    const outcomes: Outcome[] = [];
    // BEGIN and COMMIT go straight to the writer connection: through Sequelize's transaction
    // they cost several turns of the busy event loop each (npm run bench, api). The models get
    // a Transaction object bound to the same connection, so their statements join in.
    let connection: WeirConnection | null = null;
    const outer = new Transaction(sequelize, { type: Transaction.TYPES.IMMEDIATE }) as Transaction & { connection?: WeirConnection; finished?: string };
    let begun = false;
    try {
      connection = await manager.getConnection({ uuid: WRITER });
      outer.connection = connection;
      const sql = sqlOn(async () => connection!);
      await sql.run('BEGIN IMMEDIATE');
      begun = true;
      // Checked before the COMMIT: pipelined statements and savepoint releases.
      const inFlight: Promise<unknown>[] = [];
      const track = (p: Promise<unknown>) => {
        p.catch(() => undefined);
        inFlight.push(p);
      };
      const savepoints = group.length > 1;
      for (const job of group) {
        // Each write sees its own Transaction object (one made on the group's), so what a
        // service keeps per transaction (the change log's head) goes with the write's
        // savepoint. The savepoint statements are issued unawaited: the writer runs them in
        // order.
        const opened = savepoints ? sql.run('SAVEPOINT weir_write') : Promise.resolve();
        opened.catch(() => undefined);
        try {
          const result = await job.fn(savepoints ? (Object.create(outer) as Transaction) : outer);
          let value = result;
          if (job.pipelined) {
            const { value: v, issued } = result as Issued<unknown>;
            value = v;
            track(issued);
          }
          await opened;
          if (savepoints) track(sql.run('RELEASE weir_write'));
          outcomes.push({ ok: true, value });
        } catch (error) {
          outcomes.push({ ok: false, error });
          if (!savepoints) throw error;
          // Without its savepoint, or when SQLite ended the whole transaction itself (a full
          // disk, an I/O error), nothing of the group may count: these throw.
          await opened;
          await sql.run('ROLLBACK TO weir_write');
          await sql.run('RELEASE weir_write');
        }
      }
      await Promise.all(inFlight);
      await sql.run('COMMIT');
      outer.finished = 'commit';
    } catch (error) {
      outer.finished = 'rollback';
      if (begun && connection) {
        // A failed COMMIT leaves the transaction open. If even ROLLBACK fails, the
        // connection's state is unknown: close it, and the next group opens a new writer.
        const c = connection;
        await new Promise<void>((resolve) => c.run('ROLLBACK', (err: Error | null) => (err ? void manager.destroyConnection(c).then(resolve, resolve) : resolve())));
      }
      // BEGIN, COMMIT or a whole-group failure: no write of the group was stored.
      group.forEach((job, i) => {
        const own = outcomes[i];
        job.reject(own && !own.ok ? own.error : error);
      });
      return;
    }
    group.forEach((job, i) => {
      const o = outcomes[i];
      if (o.ok) job.resolve(o.value);
      else job.reject(o.error);
    });
  }

  async function drain() {
    running = true;
    try {
      while (waiting.length) await runGroup(waiting.splice(0, GROUP_MAX));
    } finally {
      running = false;
    }
  }

  const enqueue = <T>(fn: (t: Transaction) => Promise<unknown>, pipelined: boolean): Promise<T> =>
    new Promise<T>((resolve, reject) => {
      waiting.push({ fn, pipelined, resolve: resolve as (v: unknown) => void, reject });
      if (!running) void drain();
    });
  return {
    write: <T>(fn: (t: Transaction) => Promise<T>) => enqueue<T>(fn, false),
    writePipelined: <T>(fn: (t: Transaction) => Promise<Issued<T>>) => enqueue<T>(fn, true),
    queued: () => waiting.length,
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
export interface DatabaseOptions {
  /** Told of every statement SQLite runs, on every connection, with its time (benchmarks, diagnosis). */
  onStatement?: (sql: string, ms: number) => void;
}

export async function openDatabase(file: string, options: DatabaseOptions = {}): Promise<Database> {
  if (openFile) throw new Error(`a database is open already in this process (${openFile}): close it first`);
  openFile = file;
  mkdirSync(path.dirname(file), { recursive: true });
  const sequelize = new Sequelize({
    dialect: 'sqlite',
    dialectModule: sqlite3,
    storage: file,
    logging: false,
    // Sequelize's pool is not what serves SQLite: configureEachConnection says which connection runs what.
    pool: { max: 1, min: 0, idle: 10_000 },
  });
  configureEachConnection(sequelize, options);
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

  const writer = createWriter(sequelize);
  // Opened read-only, so that no write of this process can ever run on it.
  let watch: Promise<sqlite3.Database> | null = null;
  const watcher = () =>
    (watch ??= new Promise<sqlite3.Database>((resolve, reject) => {
      const c: sqlite3.Database = new sqlite3.Database(file, sqlite3.OPEN_READONLY, (err) => {
        if (err) {
          watch = null;
          reject(err);
        } else {
          c.configure('busyTimeout', BUSY_TIMEOUT_MS);
          if (options.onStatement) c.on('profile', options.onStatement);
          resolve(c);
        }
      });
    }));
  // Kept prepared: these run on every request.
  const prepared = new Map<string, Promise<sqlite3.Statement>>();
  const statement = (sql: string) => {
    let p = prepared.get(sql);
    if (!p) {
      p = watcher().then(
        (c) =>
          new Promise<sqlite3.Statement>((resolve, reject) => {
            const st: sqlite3.Statement = c.prepare(sql, (err) => (err ? reject(err) : resolve(st)));
          }),
      );
      p.catch(() => prepared.delete(sql));
      prepared.set(sql, p);
    }
    return p;
  };
  const getPrepared = async <T>(sql: string, params: readonly Param[]) => {
    const st = await statement(sql);
    // `all`, not `get`: a statement stepped to its end holds no read transaction open (one left
    // at its first row would pin this connection to an old snapshot).
    return new Promise<T | undefined>((resolve, reject) => st.all(params, (err: Error | null, rows: T[]) => (err ? reject(err) : resolve(rows[0]))));
  };
  const VERSION = '(SELECT data_version FROM pragma_data_version)';
  const dataVersion = async () => (await getPrepared<{ v: number }>(`SELECT ${VERSION} AS v`, []))!.v;
  const manager = sequelize.connectionManager as unknown as { getConnection(options: object): Promise<WeirConnection> };
  // The connection Sequelize keeps for statements outside transactions (set up as above).
  const shared = sqlOn(() => manager.getConnection({}));
  return {
    sequelize,
    file,
    write: writer.write,
    writePipelined: writer.writePipelined,
    queuedWrites: writer.queued,
    dataVersion,
    async getAtVersion<T>(sql: string, params: readonly Param[]) {
      // The caller's SELECT, with the version as one more column of the same statement.
      const row = await getPrepared<T & { weirDataVersion: number }>(`SELECT ${VERSION} AS weirDataVersion, q.* FROM (${sql}) AS q`, params);
      if (!row) return { row: undefined, dataVersion: await dataVersion() };
      const { weirDataVersion, ...rest } = row;
      return { row: rest as unknown as T, dataVersion: weirDataVersion };
    },
    sql(t?: Transaction) {
      if (!t) return shared;
      return sqlOn(async () => {
        const c = (t as unknown as { connection?: sqlite3.Database }).connection;
        if (!c) throw new Error('the transaction has no connection: it has finished');
        return c;
      });
    },
    async close() {
      for (const p of prepared.values()) {
        const st = await p.catch(() => null);
        if (st) await new Promise<void>((resolve) => st.finalize(() => resolve()));
      }
      prepared.clear();
      if (watch) {
        const c = await watch.catch(() => null);
        watch = null;
        if (c) await new Promise<void>((resolve) => c.close(() => resolve()));
      }
      await sequelize.close();
      openFile = null;
    },
  };
}
