// SQL of API tokens. Tokens are found by the SHA-256 of the secret through a unique index.
import type { EntityManager } from 'typeorm';
import type { ApiToken, ApiTokenAccess } from '@beadroll/rules';

const selectToken = `
  SELECT t.id, t.name, t.access, t.prefix,
         to_char(t.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "createdAt",
         to_char(t.last_used_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "lastUsedAt",
         to_char(t.revoked_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "revokedAt",
         json_build_object('id', u.id, 'name', u.name) AS "createdBy",
         COALESCE((SELECT json_agg(json_build_object('id', s.id, 'name', s.name, 'code', s.code) ORDER BY s.code)
                     FROM shops s WHERE s.id = ANY (t.shop_ids)), '[]'::json) AS shops
    FROM api_tokens t JOIN users u ON u.id = t.created_by`;

export async function listTokens(db: EntityManager, organizationId: string): Promise<ApiToken[]> {
  return db.query(`${selectToken} WHERE t.organization_id = $1 ORDER BY t.revoked_at IS NOT NULL, t.created_at DESC`, [
    organizationId,
  ]);
}

export async function findToken(db: EntityManager, organizationId: string, id: string): Promise<ApiToken | null> {
  const rows: ApiToken[] = await db.query(`${selectToken} WHERE t.organization_id = $1 AND t.id = $2`, [
    organizationId,
    id,
  ]);
  return rows[0] ?? null;
}

export async function insertToken(
  db: EntityManager,
  t: {
    organizationId: string;
    name: string;
    access: ApiTokenAccess;
    shopIds: string[];
    prefix: string;
    hash: string;
    createdBy: string;
    at: Date;
  },
): Promise<string> {
  const [row] = await db.query<{ id: string }[]>(
    `INSERT INTO api_tokens (organization_id, name, access, shop_ids, prefix, token_hash, created_by, created_at)
     VALUES ($1, $2, $3, $4::uuid[], $5, $6, $7, $8) RETURNING id`,
    [t.organizationId, t.name, t.access, t.shopIds, t.prefix, t.hash, t.createdBy, t.at],
  );
  return row!.id;
}

/** Marks a live token revoked; false when there was no live token of that id in the company. */
export async function revokeToken(
  db: EntityManager,
  organizationId: string,
  id: string,
  by: string,
  at: Date,
): Promise<boolean> {
  // UPDATE … RETURNING: TypeORM's postgres driver answers [rows, affected count].
  const [rows] = await db.query<[unknown[], number]>(
    `UPDATE api_tokens SET revoked_at = $4, revoked_by = $3
      WHERE organization_id = $1 AND id = $2 AND revoked_at IS NULL RETURNING id`,
    [organizationId, id, by, at],
  );
  return rows.length > 0;
}

export interface TokenHolder {
  tokenId: string;
  access: ApiTokenAccess;
  shopIds: string[];
  userId: string;
  organizationId: string;
}

/**
 * The live token with this hash whose creator is still an active QA manager of the same company, and its
 * last use moved to `at` (written at most once a minute, so reads do not turn into a write each).
 */
export async function useToken(db: EntityManager, hash: string, at: Date): Promise<TokenHolder | null> {
  const rows: TokenHolder[] = await db.query(
    `WITH t AS (
       SELECT t.id, t.access, t.shop_ids, t.created_by, t.organization_id, t.last_used_at
         FROM api_tokens t JOIN users u ON u.id = t.created_by
        WHERE t.token_hash = $1 AND t.revoked_at IS NULL
          AND u.active AND u.role = 'qa_manager' AND u.organization_id = t.organization_id
     ), touched AS (
       UPDATE api_tokens a SET last_used_at = $2 FROM t
        WHERE a.id = t.id AND (t.last_used_at IS NULL OR t.last_used_at < $2::timestamptz - interval '1 minute')
     )
     SELECT id AS "tokenId", access, shop_ids::text[] AS "shopIds", created_by AS "userId",
            organization_id AS "organizationId" FROM t`,
    [hash, at],
  );
  return rows[0] ?? null;
}
