import { ApiToken, type ApiTokenScope } from "~/lib/db.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import type { UserView } from "~/lib/auth/users.server";

/**
 * Personal API tokens: created and revoked by their owner; sent as `Authorization: Bearer
 * <token>`. Only the SHA-256 of a token is stored, so a token is shown once, when created. A
 * read-only token reads what its owner may read and changes nothing (403 on any other method);
 * a token past its expiry signs nobody in.
 */
export interface ApiTokenView {
  id: number;
  name: string;
  scope: ApiTokenScope;
  expiresAt: string | null;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

function present(token: ApiToken): ApiTokenView {
  return {
    id: token.id,
    name: token.name,
    scope: token.scope,
    expiresAt: token.expiresAt ? token.expiresAt.toISOString() : null,
    createdAt: token.createdAt.toISOString(),
    lastUsedAt: token.lastUsedAt ? token.lastUsedAt.toISOString() : null,
    revokedAt: token.revokedAt ? token.revokedAt.toISOString() : null,
  };
}

export interface ApiTokenOptions {
  scope?: ApiTokenScope;
  /** Days until it expires; null or absent: until revoked. */
  expiresInDays?: number | null;
}

export async function createApiToken(owner: Pick<UserView, "id">, name: string, options: ApiTokenOptions = {}, now = new Date()): Promise<{ token: string; view: ApiTokenView }> {
  const { token, tokenHash } = createLinkToken();
  const expiresAt = options.expiresInDays ? new Date(now.getTime() + options.expiresInDays * 24 * 3600_000) : null;
  const record = await ApiToken.create({ userId: owner.id, name: name.trim().slice(0, 120) || "API token", tokenHash, scope: options.scope ?? "read-write", expiresAt });
  return { token: `fs_${token}`, view: present(record) };
}

export async function listApiTokens(owner: Pick<UserView, "id">): Promise<ApiTokenView[]> {
  const tokens = await ApiToken.findAll({ where: { userId: owner.id }, order: [["createdAt", "DESC"]] });
  return tokens.map(present);
}

export async function revokeApiToken(owner: Pick<UserView, "id">, tokenId: number): Promise<boolean> {
  const [updated] = await ApiToken.update({ revokedAt: new Date() }, { where: { id: tokenId, userId: owner.id, revokedAt: null } });
  return updated > 0;
}

/** What a bearer token stands for: its user and scope, "expired", or null (malformed, unknown or revoked). */
export type BearerLookup = { userId: number; scope: ApiTokenScope } | "expired" | null;

export async function lookUpBearer(authorization: string | null, now = new Date()): Promise<BearerLookup> {
  const match = authorization ? /^Bearer\s+(fs_[A-Za-z0-9_-]{20,})\s*$/.exec(authorization) : null;
  if (!match) return null;
  const record = await ApiToken.findOne({ where: { tokenHash: hashLinkToken(match[1].slice(3)), revokedAt: null } });
  if (!record) return null;
  if (record.expiresAt && record.expiresAt.getTime() <= now.getTime()) return "expired";
  // lastUsedAt is informational; a failed write must not fail the request.
  void record.update({ lastUsedAt: now }).catch(() => undefined);
  return { userId: record.userId, scope: record.scope };
}

export function hasBearer(request: Request): boolean {
  return /^Bearer\s/i.test(request.headers.get("Authorization") ?? "");
}
