// `npm run seed -w @beadroll/api`: the demo scenario — an invented company with three shops, about forty
// invented welders and one sign-in per role — plus a second invented company for cross-company checks.
// Idempotent: rows are found by their natural keys and only missing ones are added. Refuses to run
// against production (NODE_ENV=production, or a database whose name ends in _prod).
import { pathToFileURL } from 'node:url';
import type { DataSource, EntityManager } from 'typeorm';
import { loadConfig, type Config } from '../config.js';
import { hashPassword } from '../auth/passwords.js';
import { createDataSource, runMigrations } from './data-source.js';
import { createStorage, type Storage } from '../lib/storage.js';
import { createMailer } from '../lib/mailer.js';
import { createLogger } from '../lib/logger.js';
import { systemClock, type Clock } from '../lib/context.js';
import { seedRecords, type RecordsSeedResult } from './seed-records.js';
import { seedContinuity, type ContinuitySeedResult } from './seed-continuity.js';
import { seedWelds } from './seed-welds.js';

export const DEMO_PASSWORD = 'demo-weld-2026';
export const DEMO_ACCOUNTS = {
  qa: 'qa@beadroll-demo.example',
  foreman: 'foreman@beadroll-demo.example',
  welder: 'welder@beadroll-demo.example',
  otherCompanyQa: 'other@beadroll-demo.example',
} as const;

const HARROW = 'Harrow Point Fabrication';
const DUNMORE = 'Dunmore Kettle Works';

const harrowShops = [
  { code: 'PV', name: 'Vessel Bay', location: 'Building 2 — pressure vessels' },
  { code: 'ST', name: 'Structural Hall', location: 'Building 4 — structural steel' },
  { code: 'PL', name: 'Field Crew North', location: 'Pipeline spreads, northern district' },
];

// Invented names for an invented company.
const harrowWelders: Record<string, string[]> = {
  PV: [
    'Ansel Varga-Moreau',
    'Bettina Quarrie',
    'Caius Ndlovu-Hart',
    'Dara Fenwick-Osei',
    'Elio Brannagh',
    'Fenna Oduya',
    'Jesse Okonkwo-Lind',
    'Gideon Pascoe-Lund',
    'Halvard Emberly',
    'Ines Okafor-Strand',
    'Kasimir Thorne-Abara',
    'Linnea Drummond-Yusuf',
    'Matthias Orrell',
    'Noor Castellane',
    'Oskar Vellacott',
  ],
  ST: [
    'Priya Hallorann',
    'Quill Madsen-Obi',
    'Rosalind Achterberg',
    'Soren Mbeki-Hale',
    'Tamsin Okoro-Vance',
    'Ulrich Penhallow',
    'Vesna Caldwell-Ige',
    'Wendell Ashgrove',
    'Xanthe Brightwater',
    'Yusuf Halloway-Kern',
    'Zora Teague-Mensah',
    'Anselm Crowhurst',
    'Bram Oyelaran',
    'Cosima Wetherell',
  ],
  PL: [
    'Dmitri Ashcombe',
    'Efua Lindqvist-Roe',
    'Florian Achebe-Marsh',
    'Greer Tolliver-Nwosu',
    'Hakon Everleigh',
    'Ilse Mbatha-Crane',
    'Joaquin Redfern-Saar',
    'Keziah Ollerton',
    'Lorcan Adebayo-Fisk',
    'Mireille Strand-Okeke',
    'Nils Ravensworth',
  ],
};
/** Welders who have left the company (kept on record, never deleted). */
const leftStamps = new Set(['ST-13', 'PL-11']);

export function assertSeedAllowed(config: Pick<Config, 'nodeEnv' | 'db'>): void {
  if (config.nodeEnv === 'production') throw new Error('Refusing to seed demo data: NODE_ENV is production');
  if (/_prod$/i.test(config.db.database))
    throw new Error(`Refusing to seed demo data: database ${config.db.database} looks like production`);
}

export interface SeedResult {
  created: { organizations: number; shops: number; welders: number; users: number } & RecordsSeedResult &
    ContinuitySeedResult & { welds: number };
}

async function ensureOrganization(db: EntityManager, name: string, r: SeedResult): Promise<string> {
  const found: { id: string }[] = await db.query(
    `SELECT id FROM organizations WHERE name = $1 ORDER BY created_at LIMIT 1`,
    [name],
  );
  if (found[0]) return found[0].id;
  const [row] = await db.query<{ id: string }[]>(
    `INSERT INTO organizations (name) VALUES ($1) RETURNING id`,
    [name],
  );
  r.created.organizations++;
  return row!.id;
}

async function ensureShop(
  db: EntityManager,
  org: string,
  s: { code: string; name: string; location: string },
  r: SeedResult,
): Promise<string> {
  const inserted: unknown[] = await db.query(
    `INSERT INTO shops (organization_id, code, name, location) VALUES ($1, $2, $3, $4)
     ON CONFLICT (organization_id, code) DO NOTHING RETURNING id`,
    [org, s.code, s.name, s.location],
  );
  r.created.shops += inserted.length;
  const [row] = await db.query<{ id: string }[]>(
    `SELECT id FROM shops WHERE organization_id = $1 AND code = $2`,
    [org, s.code],
  );
  return row!.id;
}

async function ensureWelder(
  db: EntityManager,
  org: string,
  w: { stamp: string; name: string; shopId: string; email: string; active: boolean },
  r: SeedResult,
): Promise<string> {
  const inserted: unknown[] = await db.query(
    `INSERT INTO welders (organization_id, stamp, name, home_shop_id, email, active, left_at)
     VALUES ($1, $2, $3, $4, $5, $6, CASE WHEN $6 THEN NULL ELSE now() END)
     ON CONFLICT (organization_id, stamp) DO NOTHING RETURNING id`,
    [org, w.stamp, w.name, w.shopId, w.email, w.active],
  );
  r.created.welders += inserted.length;
  const [row] = await db.query<{ id: string }[]>(
    `SELECT id FROM welders WHERE organization_id = $1 AND stamp = $2`,
    [org, w.stamp],
  );
  return row!.id;
}

async function ensureUser(
  db: EntityManager,
  org: string,
  u: {
    email: string;
    name: string;
    role: string;
    passwordHash: string;
    welderId?: string;
    shopIds?: string[];
  },
  r: SeedResult,
): Promise<void> {
  const inserted: { id: string }[] = await db.query(
    `INSERT INTO users (organization_id, email, name, role, password_hash, welder_id, invited_at)
     VALUES ($1, $2, $3, $4, $5, $6, now())
     ON CONFLICT (organization_id, email) DO NOTHING RETURNING id`,
    [org, u.email, u.name, u.role, u.passwordHash, u.welderId ?? null],
  );
  r.created.users += inserted.length;
  const [user] = inserted;
  // Assignments only for an account the seed created: a foreman re-assigned by hand stays as they are.
  if (user && u.shopIds?.length)
    await db.query(
      `INSERT INTO foreman_shops (user_id, shop_id) SELECT $1, unnest($2::uuid[]) ON CONFLICT DO NOTHING`,
      [user.id, u.shopIds],
    );
}

export async function seedDemo(
  dataSource: DataSource,
  config: Config,
  opts: { storage?: Storage; clock?: Clock } = {},
): Promise<SeedResult> {
  assertSeedAllowed(config);
  const passwordHash = await hashPassword(DEMO_PASSWORD);
  const result: SeedResult = {
    created: {
      organizations: 0,
      shops: 0,
      welders: 0,
      users: 0,
      procedures: 0,
      coupons: 0,
      qualifications: 0,
      uploads: 0,
      continuityEntries: 0,
      revocations: 0,
      renewals: 0,
      welds: 0,
    },
  };
  const harrowId = await dataSource.transaction(async (db) => {
    // Two seeds at once (two terminals) would otherwise both create the organization.
    await db.query(`SELECT pg_advisory_xact_lock(hashtext('beadroll-demo-seed'))`);

    const harrow = await ensureOrganization(db, HARROW, result);
    const shopIds: Record<string, string> = {};
    for (const s of harrowShops) shopIds[s.code] = await ensureShop(db, harrow, s, result);
    let jesse = '';
    for (const [code, names] of Object.entries(harrowWelders)) {
      for (const [i, name] of names.entries()) {
        const stamp = `${code}-${String(i + 1).padStart(2, '0')}`;
        const isDemoWelder = stamp === 'PV-07';
        const email = isDemoWelder
          ? DEMO_ACCOUNTS.welder
          : i % 3 === 0
            ? `${stamp.toLowerCase()}@harrow-point.example`
            : '';
        const id = await ensureWelder(
          db,
          harrow,
          { stamp, name, shopId: shopIds[code]!, email, active: !leftStamps.has(stamp) },
          result,
        );
        if (isDemoWelder) jesse = id;
      }
    }
    await ensureUser(
      db,
      harrow,
      { email: DEMO_ACCOUNTS.qa, name: 'Morgan Adeyemi-Clarke', role: 'qa_manager', passwordHash },
      result,
    );
    await ensureUser(
      db,
      harrow,
      {
        email: DEMO_ACCOUNTS.foreman,
        name: 'Rowan Castellanos',
        role: 'foreman',
        passwordHash,
        shopIds: [shopIds.PV!, shopIds.ST!],
      },
      result,
    );
    await ensureUser(
      db,
      harrow,
      {
        email: DEMO_ACCOUNTS.welder,
        name: 'Jesse Okonkwo-Lind',
        role: 'welder',
        passwordHash,
        welderId: jesse,
      },
      result,
    );

    const dunmore = await ensureOrganization(db, DUNMORE, result);
    const kettle = await ensureShop(
      db,
      dunmore,
      { code: 'KW', name: 'Kettle Shop', location: 'Dunmore yard' },
      result,
    );
    for (const [i, name] of ['Tobiah Wrenfield', 'Marisol Kettering-Ade', 'Ewan Blackthorne-Sato'].entries())
      await ensureWelder(
        db,
        dunmore,
        { stamp: `KW-${String(i + 1).padStart(2, '0')}`, name, shopId: kettle, email: '', active: true },
        result,
      );
    await ensureUser(
      db,
      dunmore,
      { email: DEMO_ACCOUNTS.otherCompanyQa, name: 'Sasha Threlkeld', role: 'qa_manager', passwordHash },
      result,
    );
    return harrow;
  });

  // The records go through the API's services (each write its own transaction), under a session lock so
  // that two seeds at once do not both add them.
  const storage = opts.storage ?? createStorage(config.s3);
  const mailer = createMailer(config.smtp);
  const runner = dataSource.createQueryRunner();
  await runner.connect();
  try {
    await runner.query(`SELECT pg_advisory_lock(hashtext('beadroll-demo-records'))`);
    const [qa] = (await runner.query(`SELECT id FROM users WHERE email = $1`, [DEMO_ACCOUNTS.qa])) as {
      id: string;
    }[];
    const records = await seedRecords(
      {
        config,
        dataSource,
        storage,
        mailer,
        logger: createLogger(config),
        clock: opts.clock ?? systemClock,
      },
      harrowId,
      qa!.id,
    );
    Object.assign(result.created, records);
    // Continuity history on top of the records (relative to today), in the same session lock.
    const continuityDeps = { config, dataSource, storage, mailer, logger: createLogger(config), clock: opts.clock ?? systemClock };
    Object.assign(result.created, await seedContinuity(continuityDeps, harrowId, qa!.id));
    // Production welds last: each is checked against the qualifications and continuity seeded above.
    result.created.welds = await seedWelds(continuityDeps, harrowId, qa!.id);
  } finally {
    await runner.query(`SELECT pg_advisory_unlock(hashtext('beadroll-demo-records'))`).catch(() => undefined);
    await runner.release();
    mailer.close();
    if (!opts.storage) storage.close();
  }
  return result;
}

if (import.meta.url === pathToFileURL(process.argv[1] ?? '').href) {
  const config = loadConfig();
  try {
    assertSeedAllowed(config);
  } catch (err) {
    console.error(`beadroll: ${(err as Error).message}`);
    process.exit(1);
  }
  // One connection holds the seed's lock while the services write through the others.
  const dataSource = createDataSource(config.db, { poolSize: 3 });
  try {
    await dataSource.initialize();
    await runMigrations(dataSource);
    const { created } = await seedDemo(dataSource, config);
    const added = Object.values(created).reduce((a, b) => a + b, 0);
    console.log(
      added === 0
        ? `beadroll: demo data already present in ${config.db.database}`
        : `beadroll: demo data added to ${config.db.database} (${created.organizations} companies, ${created.shops} shops, ${created.welders} welders, ${created.users} sign-ins, ${created.procedures} WPS, ${created.coupons} coupons, ${created.qualifications} qualifications, ${created.uploads} files, ${created.continuityEntries} logged uses)`,
    );
    console.log(
      `beadroll: demo sign-ins (password ${DEMO_PASSWORD}): ${DEMO_ACCOUNTS.qa}, ${DEMO_ACCOUNTS.foreman}, ${DEMO_ACCOUNTS.welder}`,
    );
  } catch (err) {
    console.error(`beadroll: seeding failed: ${err instanceof Error ? err.message : String(err)}`);
    process.exitCode = 1;
  } finally {
    if (dataSource.isInitialized) await dataSource.destroy();
  }
}
