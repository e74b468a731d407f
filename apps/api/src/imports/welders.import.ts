// Import of welders: stamp (the natural key), name, home shop (its code or name), e-mail. Each row is
// checked with the same schema as the Add welder form.
import { welderInput } from '@beadroll/rules';
import {
  addZodIssues,
  batches,
  Columns,
  Findings,
  type FieldDef,
  type ImportPlan,
  type KindDef,
  type PlanContext,
  breathe,
  type Tick,
  shopsByCodeOrName,
} from './import-plan.js';

const fields: FieldDef[] = [
  { key: 'stamp', label: 'Stamp', required: true, hint: 'The welder’s stamp, e.g. W-104', aliases: ['welder stamp', 'stamp no', 'stamp number', 'welder id', 'id'] },
  { key: 'name', label: 'Name', required: true, hint: 'Full name', aliases: ['welder', 'welder name', 'full name'] },
  { key: 'homeShop', label: 'Home shop', required: true, hint: 'The shop’s code or name', aliases: ['shop', 'shop code', 'home shop code', 'location'] },
  { key: 'email', label: 'E-mail', required: false, hint: 'Optional; a blank cell keeps the e-mail on record', aliases: ['e-mail', 'email address', 'mail'] },
];

interface Existing {
  id: string;
  stamp: string;
  name: string;
  homeShopId: string;
  email: string;
}

async function plan(ctx: PlanContext): Promise<ImportPlan> {
  const { db, actor, sheet } = ctx;
  const cols = new Columns(fields, ctx);
  const findings = new Findings();
  const shopByKey = await shopsByCodeOrName(db, actor.organizationId);
  const shopCode = new Map([...shopByKey.values()].map((s) => [s.id, s.code]));
  const existing = new Map(
    (
      await db.query<Existing[]>(
        `SELECT id, stamp, name, home_shop_id AS "homeShopId", email FROM welders WHERE organization_id = $1`,
        [actor.organizationId],
      )
    ).map((w) => [w.stamp, w]),
  );

  const inserts: { stamp: string; name: string; homeShopId: string; email: string }[] = [];
  const updates: { id: string; name: string; homeShopId: string; email: string }[] = [];
  const seen = new Map<string, number>();
  for (const [i, row] of sheet.rows.entries()) {
    if (i % 2000 === 1999) await breathe();
    const shopText = cols.get(row, 'homeShop');
    const shop = shopByKey.get(shopText.toLowerCase());
    if (shopText && !shop)
      findings.add(row.line, cols.header('homeShop'), `No shop “${shopText}” in your company; use a shop code such as ${shopCode.values().next().value ?? 'MAIN'}`);
    const parsed = welderInput.safeParse({
      stamp: cols.get(row, 'stamp'),
      name: cols.get(row, 'name'),
      homeShopId: shop?.id ?? '00000000-0000-4000-8000-000000000000',
      email: cols.get(row, 'email'),
    });
    if (!parsed.success) {
      addZodIssues(
        findings,
        cols,
        row.line,
        parsed.error,
        { homeShopId: 'homeShop' },
      );
      if (!shopText) findings.add(row.line, cols.header('homeShop'), 'Required');
      continue;
    }
    const w = parsed.data;
    const dup = seen.get(w.stamp);
    if (dup !== undefined) {
      findings.add(row.line, cols.header('stamp'), `Stamp ${w.stamp} is already on row ${dup} of this file`);
      continue;
    }
    seen.set(w.stamp, row.line);
    if (findings.has(row.line) || !shop) continue;
    const old = existing.get(w.stamp);
    // A blank optional cell is "not in this file", never "erase it".
    if (old && w.email === '') w.email = old.email;
    if (!old) {
      findings.counts.new++;
      inserts.push({ stamp: w.stamp, name: w.name, homeShopId: shop.id, email: w.email });
    } else if (old.name === w.name && old.homeShopId === shop.id && old.email === w.email) {
      findings.counts.unchanged++;
    } else {
      const before = { name: old.name, homeShop: shopCode.get(old.homeShopId) ?? '', email: old.email };
      const after = { name: w.name, homeShop: shop.code, email: w.email };
      findings.change(row.line, w.stamp, before, after);
      updates.push({ id: old.id, name: w.name, homeShopId: shop.id, email: w.email });
    }
  }
  const missing = cols.missing();
  for (const m of missing) findings.add(1, null, `Choose the column that holds “${m}”`);

  return {
    report: findings.report(sheet.rows.length),
    async apply(db: PlanContext['db'], tick: Tick) {
      const total = inserts.length + updates.length;
      let done = 0;
      for (const b of batches(inserts, 2000)) {
        await db.query(
          `INSERT INTO welders (organization_id, stamp, name, home_shop_id, email)
           SELECT $1, * FROM unnest($2::text[], $3::text[], $4::uuid[], $5::text[])`,
          [actor.organizationId, b.map((w) => w.stamp), b.map((w) => w.name), b.map((w) => w.homeShopId), b.map((w) => w.email)],
        );
        done += b.length;
        await tick('writing', done, total);
      }
      for (const b of batches(updates, 2000)) {
        await db.query(
          `UPDATE welders w SET name = u.name, home_shop_id = u.shop, email = u.email, version = w.version + 1, updated_at = now()
             FROM unnest($2::uuid[], $3::text[], $4::uuid[], $5::text[]) AS u(id, name, shop, email)
            WHERE w.id = u.id AND w.organization_id = $1`,
          [actor.organizationId, b.map((w) => w.id), b.map((w) => w.name), b.map((w) => w.homeShopId), b.map((w) => w.email)],
        );
        done += b.length;
        await tick('writing', done, total);
      }
      return { added: inserts.length, changed: updates.length };
    },
  };
}

export const weldersImport: KindDef = { fields, plan };
