/**
 * Personal API tokens: what a token may do and how long it may live. Shared by the server (which
 * enforces) and the settings page (which offers the choices).
 */
export const TOKEN_SCOPES = ["read", "read-write"] as const;
export type TokenScope = (typeof TOKEN_SCOPES)[number];

export const tokenScopeLabels: Record<TokenScope, string> = {
  read: "Read only",
  "read-write": "Read and write",
};

/** Expiry in whole days: 90 unless chosen, at most a year (common practice for personal tokens). */
export const TOKEN_DEFAULT_DAYS = 90;
export const TOKEN_MAX_DAYS = 365;

/** Every token starts with this, so a leaked one is recognisable (for example by secret scanners). */
export const TOKEN_PREFIX = "itk_";

/** The capabilities a read token keeps; every other capability is a write and needs read-write. */
export const READ_CAPABILITIES = ["campaign:read"] as const;
