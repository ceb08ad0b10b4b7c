import { ApiToken } from "~/lib/db.server";
import { createLinkToken, hashLinkToken } from "~/lib/auth/tokens.server";
import type { UserView } from "~/lib/auth/users.server";

/**
 * Personal API tokens: created and revoked by their owner; sent as `Authorization: Bearer
 * <token>`. Only the SHA-256 of a token is stored, so a token is shown once, when created.
 */
export interface ApiTokenView {
  id: number;
  name: string;
  createdAt: string;
  lastUsedAt: string | null;
  revokedAt: string | null;
}

function present(token: ApiToken): ApiTokenView {
  return {
    id: token.id,
    name: token.name,
    createdAt: token.createdAt.toISOString(),
    lastUsedAt: token.lastUsedAt ? token.lastUsedAt.toISOString() : null,
    revokedAt: token.revokedAt ? token.revokedAt.toISOString() : null,
  };
}

export async function createApiToken(owner: Pick<UserView, "id">, name: string): Promise<{ token: string; view: ApiTokenView }> {
  const { token, tokenHash } = createLinkToken();
  const record = await ApiToken.create({ userId: owner.id, name: name.trim().slice(0, 120) || "API token", tokenHash });
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

/** The user id a bearer token stands for, or null (unknown or revoked). */
export async function userIdForBearer(authorization: string | null): Promise<number | null> {
  const match = authorization ? /^Bearer\s+(fs_[A-Za-z0-9_-]{20,})\s*$/.exec(authorization) : null;
  if (!match) return null;
  const record = await ApiToken.findOne({ where: { tokenHash: hashLinkToken(match[1].slice(3)), revokedAt: null } });
  if (!record) return null;
  // lastUsedAt is informational; a failed write must not fail the request.
  void record.update({ lastUsedAt: new Date() }).catch(() => undefined);
  return record.userId;
}

export function hasBearer(request: Request): boolean {
  return /^Bearer\s/i.test(request.headers.get("Authorization") ?? "");
}
